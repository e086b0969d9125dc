//! `gonogo lsp`: a Language Server Protocol server on standard input and output, for rule
//! writers' editors. Synchronous: one loop reads a message and answers it before the next
//! (the `lsp-server` crate frames the JSON-RPC messages with their `Content-Length` headers).
//! Every change of an open document lints its rulebook again and publishes the problems of
//! each file read; the requests answered are listed in [`capabilities`].

pub mod completion;
pub mod diagnostics;
pub mod format;
pub mod hover;
pub mod index;
pub mod navigate;
pub mod position;
pub mod symbols;
pub mod uri;
pub mod workspace;

use std::collections::HashSet;
use std::path::PathBuf;

use lsp_server::{Connection, ErrorCode, Message, Notification, Request, Response};
use lsp_types::notification::{
    DidChangeTextDocument, DidCloseTextDocument, DidOpenTextDocument, DidSaveTextDocument,
    Notification as _, PublishDiagnostics,
};
use lsp_types::request::{
    Completion, DocumentSymbolRequest, Formatting, GotoDefinition, HoverRequest, References,
    Request as _,
};
use lsp_types::{
    CompletionOptions, CompletionResponse, DocumentSymbolResponse, GotoDefinitionResponse, Hover,
    HoverContents, HoverProviderCapability, MarkupContent, MarkupKind, OneOf,
    PublishDiagnosticsParams, ServerCapabilities, TextDocumentPositionParams,
    TextDocumentSyncCapability, TextDocumentSyncKind, Uri,
};

use workspace::{Analysis, Workspace};

/// What the server answers: full-text sync, hover, definition, references, completion,
/// document symbols and formatting.
pub fn capabilities() -> ServerCapabilities {
    ServerCapabilities {
        text_document_sync: Some(TextDocumentSyncCapability::Kind(TextDocumentSyncKind::FULL)),
        hover_provider: Some(HoverProviderCapability::Simple(true)),
        definition_provider: Some(OneOf::Left(true)),
        references_provider: Some(OneOf::Left(true)),
        completion_provider: Some(CompletionOptions {
            trigger_characters: Some(vec![" ".to_string()]),
            ..CompletionOptions::default()
        }),
        document_symbol_provider: Some(OneOf::Left(true)),
        document_formatting_provider: Some(OneOf::Left(true)),
        ..ServerCapabilities::default()
    }
}

/// Serves one client on standard input and output until it says `exit`; `Err` when the
/// conversation broke off (the client went away, or sent what is not the protocol).
pub fn run() -> Result<(), String> {
    let (connection, threads) = Connection::stdio();
    let caps = serde_json::to_value(capabilities()).map_err(|e| e.to_string())?;
    connection.initialize(caps).map_err(|e| e.to_string())?;
    let mut server = Server {
        connection: &connection,
        workspace: Workspace::default(),
        published: HashSet::new(),
    };
    server.serve()?;
    drop(connection);
    threads.join().map_err(|e| e.to_string())
}

struct Server<'c> {
    connection: &'c Connection,
    workspace: Workspace,
    /// Documents (by URI text) that were last sent a non-empty list of diagnostics.
    published: HashSet<String>,
}

impl Server<'_> {
    fn serve(&mut self) -> Result<(), String> {
        for message in &self.connection.receiver {
            match message {
                Message::Request(request) => {
                    if self
                        .connection
                        .handle_shutdown(&request)
                        .map_err(|e| e.to_string())?
                    {
                        return Ok(());
                    }
                    let response = self.request(request);
                    self.send(Message::Response(response))?;
                }
                Message::Notification(note) => self.notification(note)?,
                Message::Response(_) => {}
            }
        }
        Ok(())
    }

    fn send(&self, message: Message) -> Result<(), String> {
        self.connection
            .sender
            .send(message)
            .map_err(|e| e.to_string())
    }

    fn notification(&mut self, note: Notification) -> Result<(), String> {
        let path = match note.method.as_str() {
            DidOpenTextDocument::METHOD => {
                let p: lsp_types::DidOpenTextDocumentParams = params(note.params)?;
                let path = uri::to_path(&p.text_document.uri);
                if let Some(path) = &path {
                    self.workspace.set(path, p.text_document.text);
                }
                path
            }
            DidChangeTextDocument::METHOD => {
                let p: lsp_types::DidChangeTextDocumentParams = params(note.params)?;
                let path = uri::to_path(&p.text_document.uri);
                if let (Some(path), Some(change)) = (&path, p.content_changes.into_iter().last()) {
                    self.workspace.set(path, change.text);
                }
                path
            }
            DidSaveTextDocument::METHOD => {
                let p: lsp_types::DidSaveTextDocumentParams = params(note.params)?;
                uri::to_path(&p.text_document.uri)
            }
            DidCloseTextDocument::METHOD => {
                let p: lsp_types::DidCloseTextDocumentParams = params(note.params)?;
                let path = uri::to_path(&p.text_document.uri);
                if let Some(path) = &path {
                    self.workspace.close(path);
                }
                path
            }
            _ => None,
        };
        match path {
            Some(path) => self.publish(&path),
            None => Ok(()),
        }
    }

    /// Lints the rulebook `path` belongs to and sends each file's diagnostics; a file that
    /// showed problems before and is no longer read gets an empty list.
    fn publish(&mut self, path: &std::path::Path) -> Result<(), String> {
        let analysis = self.workspace.analyse(path);
        let files = diagnostics::by_file(&analysis);
        let read: HashSet<String> = files.iter().map(|(u, _)| u.as_str().to_string()).collect();
        let gone: Vec<String> = self.published.difference(&read).cloned().collect();
        for (uri, diagnostics) in files {
            let key = uri.as_str().to_string();
            if diagnostics.is_empty() {
                self.published.remove(&key);
            } else {
                self.published.insert(key);
            }
            self.send_diagnostics(uri, diagnostics)?;
        }
        for key in gone {
            self.published.remove(&key);
            if let Ok(uri) = key.parse::<Uri>() {
                self.send_diagnostics(uri, Vec::new())?;
            }
        }
        Ok(())
    }

    fn send_diagnostics(
        &self,
        uri: Uri,
        diagnostics: Vec<lsp_types::Diagnostic>,
    ) -> Result<(), String> {
        let params = PublishDiagnosticsParams::new(uri, diagnostics, None);
        self.send(Message::Notification(Notification::new(
            PublishDiagnostics::METHOD.to_string(),
            params,
        )))
    }

    fn request(&self, request: Request) -> Response {
        match request.method.as_str() {
            HoverRequest::METHOD => self.answer::<HoverRequest>(request, Server::hover),
            GotoDefinition::METHOD => self.answer::<GotoDefinition>(request, Server::definition),
            References::METHOD => self.answer::<References>(request, Server::references),
            Completion::METHOD => self.answer::<Completion>(request, Server::completion),
            DocumentSymbolRequest::METHOD => {
                self.answer::<DocumentSymbolRequest>(request, Server::symbols)
            }
            Formatting::METHOD => self.answer::<Formatting>(request, Server::formatting),
            _ => Response::new_err(
                request.id,
                ErrorCode::MethodNotFound as i32,
                format!("gonogo lsp does not answer `{}`", request.method),
            ),
        }
    }

    fn answer<R: lsp_types::request::Request>(
        &self,
        request: Request,
        handle: impl FnOnce(&Self, R::Params) -> Result<R::Result, String>,
    ) -> Response {
        match serde_json::from_value::<R::Params>(request.params) {
            Ok(p) => match handle(self, p) {
                Ok(result) => Response::new_ok(request.id, result),
                Err(why) => Response::new_err(request.id, ErrorCode::RequestFailed as i32, why),
            },
            Err(e) => Response::new_err(request.id, ErrorCode::InvalidParams as i32, e.to_string()),
        }
    }

    /// The analysis of the document's rulebook, the document's file id and the byte offset.
    fn locate(
        &self,
        at: &TextDocumentPositionParams,
    ) -> Result<Option<(Analysis, crate::source::FileId, usize)>, String> {
        let path = document_path(&at.text_document.uri)?;
        let analysis = self.workspace.analyse(&path);
        let Some(id) = analysis.file_id(&path) else {
            return Ok(None);
        };
        let offset = position::offset(analysis.loaded.sources.file(id), at.position);
        Ok(Some((analysis, id, offset)))
    }

    fn hover(&self, p: lsp_types::HoverParams) -> Result<Option<Hover>, String> {
        let Some((analysis, id, offset)) = self.locate(&p.text_document_position_params)? else {
            return Ok(None);
        };
        let Some(at) = analysis.index.at(id, offset) else {
            return Ok(None);
        };
        let file = analysis.loaded.sources.file(id);
        Ok(hover::text(&analysis, at).map(|text| Hover {
            contents: HoverContents::Markup(MarkupContent {
                kind: MarkupKind::Markdown,
                value: text,
            }),
            range: Some(position::range(file, at.span)),
        }))
    }

    fn definition(
        &self,
        p: lsp_types::GotoDefinitionParams,
    ) -> Result<Option<GotoDefinitionResponse>, String> {
        let Some((analysis, id, offset)) = self.locate(&p.text_document_position_params)? else {
            return Ok(None);
        };
        Ok(navigate::definition(&analysis, id, offset).map(GotoDefinitionResponse::Scalar))
    }

    fn references(
        &self,
        p: lsp_types::ReferenceParams,
    ) -> Result<Option<Vec<lsp_types::Location>>, String> {
        let Some((analysis, id, offset)) = self.locate(&p.text_document_position)? else {
            return Ok(None);
        };
        let include = p.context.include_declaration;
        Ok(Some(navigate::references(&analysis, id, offset, include)))
    }

    fn completion(
        &self,
        p: lsp_types::CompletionParams,
    ) -> Result<Option<CompletionResponse>, String> {
        let Some((analysis, id, offset)) = self.locate(&p.text_document_position)? else {
            return Ok(None);
        };
        let file = analysis.loaded.sources.file(id);
        let line_start = file.line_start(file.line_of(offset));
        let before = file.text.get(line_start..offset).unwrap_or_default();
        Ok(Some(CompletionResponse::Array(completion::items(
            &analysis, before,
        ))))
    }

    fn symbols(
        &self,
        p: lsp_types::DocumentSymbolParams,
    ) -> Result<Option<DocumentSymbolResponse>, String> {
        let path = document_path(&p.text_document.uri)?;
        let analysis = self.workspace.analyse(&path);
        let Some(id) = analysis.file_id(&path) else {
            return Ok(None);
        };
        let book = analysis.loaded.files.files.iter().find(|(f, _)| *f == id);
        Ok(book.map(|(_, book)| {
            DocumentSymbolResponse::Nested(symbols::outline(analysis.loaded.sources.file(id), book))
        }))
    }

    fn formatting(
        &self,
        p: lsp_types::DocumentFormattingParams,
    ) -> Result<Option<Vec<lsp_types::TextEdit>>, String> {
        let path = document_path(&p.text_document.uri)?;
        let text = match self.workspace.text(&path) {
            Some(t) => t.to_string(),
            None => std::fs::read_to_string(&path).map_err(|e| e.to_string())?,
        };
        format::edits(&text).map(Some)
    }
}

fn document_path(uri: &Uri) -> Result<PathBuf, String> {
    uri::to_path(uri).ok_or_else(|| format!("`{}` is not a file gonogo can read", uri.as_str()))
}

fn params<P: serde::de::DeserializeOwned>(value: serde_json::Value) -> Result<P, String> {
    serde_json::from_value(value).map_err(|e| format!("a notification's parameters: {e}"))
}
