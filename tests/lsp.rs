//! `gonogo lsp` at the protocol level: the binary is spawned and spoken to as an editor
//! would, JSON-RPC 2.0 messages framed by `Content-Length` headers (LSP 3.17 specification,
//! "Base Protocol"), with positions in zero-based lines and UTF-16 code units ("Position").
//! A copy of the demo rulebook is opened with a planted error that is not saved to disk, so
//! the diagnostic can only come from the text the editor sent. The last test runs Neovim's
//! own client headless (`#[ignore]`d like the browser test; `.ci/run` runs it).

mod common;

use std::io::{BufRead, BufReader, Write};
use std::path::{Path, PathBuf};
use std::process::{Child, ChildStdin, Command, Stdio};
use std::sync::mpsc::{Receiver, channel};
use std::time::Duration;

use common::OrPanic;
use serde_json::{Value, json};

/// How long any one answer may take before the test fails (a hung server fails, it does not
/// hang the suite).
const PATIENCE: Duration = Duration::from_secs(60);

/// A copy of the demo rulebooks in a folder of its own, removed when dropped.
struct DemoCopy(PathBuf);

impl DemoCopy {
    fn new(name: &str) -> DemoCopy {
        let dir = std::env::temp_dir().join(format!("gonogo-{}-lsp-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(dir.join("parts")).or_panic("a scratch folder");
        let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join("rulebooks-demo");
        for file in ["tamsin-2027.rules", "parts/tamsin-parts.rules"] {
            std::fs::copy(demo.join(file), dir.join(file)).or_panic("a demo copy");
        }
        DemoCopy(dir.canonicalize().or_panic("the copy's path"))
    }

    fn path(&self, file: &str) -> PathBuf {
        self.0.join(file)
    }

    fn uri(&self, file: &str) -> String {
        format!("file://{}", self.path(file).display())
    }

    fn text(&self, file: &str) -> String {
        std::fs::read_to_string(self.path(file)).or_panic("a demo file")
    }
}

impl Drop for DemoCopy {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// The demo's compression rule with a length where a plain number belongs: C17.
fn planted(text: &str) -> String {
    let planted = text.replace(
        "require compression <= 9.5\n",
        "require compression <= 9.5 mm\n",
    );
    assert_ne!(planted, text, "the demo's compression rule moved");
    planted
}

/// A client speaking to one `gonogo lsp`.
struct Client {
    child: Child,
    stdin: ChildStdin,
    incoming: Receiver<Value>,
    next_id: i64,
}

impl Client {
    fn start() -> Client {
        let mut child = Command::new(env!("CARGO_BIN_EXE_gonogo"))
            .arg("lsp")
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::inherit())
            .spawn()
            .or_panic("gonogo lsp started");
        let stdin = child.stdin.take().or_panic("its standard input");
        let stdout = child.stdout.take().or_panic("its standard output");
        let (send, incoming) = channel();
        std::thread::spawn(move || {
            let mut reader = BufReader::new(stdout);
            while let Some(message) = read_message(&mut reader) {
                if send.send(message).is_err() {
                    break;
                }
            }
        });
        Client {
            child,
            stdin,
            incoming,
            next_id: 1,
        }
    }

    fn write(&mut self, message: &Value) {
        let body = message.to_string();
        write!(self.stdin, "Content-Length: {}\r\n\r\n{body}", body.len()).or_panic("a write");
        self.stdin.flush().or_panic("a flush");
    }

    fn notify(&mut self, method: &str, params: Value) {
        self.write(&json!({"jsonrpc": "2.0", "method": method, "params": params}));
    }

    /// Sends a request and waits for its response (notifications on the way are kept back
    /// only when they are diagnostics: those are looked at by [`Client::diagnostics`]).
    fn request(&mut self, method: &str, params: Value) -> Value {
        let id = self.next_id;
        self.next_id += 1;
        self.write(&json!({"jsonrpc": "2.0", "id": id, "method": method, "params": params}));
        loop {
            let message = self.incoming.recv_timeout(PATIENCE).or_panic("a response");
            if message["id"] == json!(id) {
                return message;
            }
        }
    }

    /// The next diagnostics published for `uri`.
    fn diagnostics(&mut self, uri: &str) -> Vec<Value> {
        loop {
            let message = self.incoming.recv_timeout(PATIENCE).or_panic("diagnostics");
            if message["method"] == "textDocument/publishDiagnostics"
                && message["params"]["uri"] == uri
            {
                return message["params"]["diagnostics"]
                    .as_array()
                    .cloned()
                    .unwrap_or_default();
            }
        }
    }

    fn initialize(&mut self) -> Value {
        let answer = self.request(
            "initialize",
            json!({"processId": null, "rootUri": null, "capabilities": {}}),
        );
        self.notify("initialized", json!({}));
        answer
    }

    fn open(&mut self, uri: &str, text: &str) {
        self.notify(
            "textDocument/didOpen",
            json!({"textDocument": {"uri": uri, "languageId": "gonogo", "version": 1, "text": text}}),
        );
    }

    /// `shutdown`, then `exit`: the server must stop with status 0 (LSP 3.17, "Exit
    /// Notification": 0 when shutdown came first).
    fn stop(mut self) {
        let answer = self.request("shutdown", Value::Null);
        assert_eq!(answer["result"], Value::Null, "{answer}");
        self.notify("exit", Value::Null);
        let status = self.child.wait().or_panic("the server's exit");
        assert_eq!(status.code(), Some(0));
    }
}

fn read_message(reader: &mut impl BufRead) -> Option<Value> {
    let mut length = None;
    loop {
        let mut line = String::new();
        if reader.read_line(&mut line).ok()? == 0 {
            return None;
        }
        let line = line.trim_end();
        if line.is_empty() {
            break;
        }
        if let Some(n) = line.strip_prefix("Content-Length: ") {
            length = n.parse::<usize>().ok();
        }
    }
    let mut body = vec![0; length?];
    reader.read_exact(&mut body).ok()?;
    serde_json::from_slice(&body).ok()
}

/// The zero-based line and UTF-16 character of the first `needle` on the line containing
/// `line_with`, computed here from the text as the specification counts them.
fn position_of(text: &str, line_with: &str, needle: &str) -> Value {
    let (line, content) = text
        .lines()
        .enumerate()
        .find(|(_, l)| l.contains(line_with))
        .or_panic("the line");
    let at = content.find(needle).or_panic("the needle");
    let character = content[..at].encode_utf16().count();
    json!({"line": line, "character": character})
}

fn at(uri: &str, position: &Value) -> Value {
    json!({"textDocument": {"uri": uri}, "position": position})
}

fn hover_text(answer: &Value) -> String {
    answer["result"]["contents"]["value"]
        .as_str()
        .or_panic("hover contents")
        .to_string()
}

#[test]
fn diagnostics_hover_and_definition_over_the_protocol() {
    let demo = DemoCopy::new("protocol");
    let uri = demo.uri("tamsin-2027.rules");
    let text = planted(&demo.text("tamsin-2027.rules"));
    let mut client = Client::start();
    let init = client.initialize();
    let caps = &init["result"]["capabilities"];
    for capability in [
        "hoverProvider",
        "definitionProvider",
        "referencesProvider",
        "documentSymbolProvider",
        "documentFormattingProvider",
    ] {
        assert_eq!(caps[capability], json!(true), "{capability}: {caps}");
    }
    client.open(&uri, &text);
    let found = client.diagnostics(&uri);
    assert_eq!(found.len(), 1, "{found:?}");
    let d = &found[0];
    assert_eq!(d["code"], "C17");
    assert_eq!(d["severity"], 1, "1 is Error in the specification");
    assert_eq!(d["source"], "gonogo");
    // the first label is the side of the wrong dimension, as `lint` shows it
    let expected = position_of(&text, "compression <= 9.5 mm", "9.5 mm");
    assert_eq!(d["range"]["start"], expected);
    assert!(
        d["message"]
            .as_str()
            .or_panic("a message")
            .contains("cannot compare a plain number with a length"),
        "{d}"
    );

    // the measurement's dimension, range and procedure
    let bore = client.request(
        "textDocument/hover",
        at(&uri, &position_of(&text, "measure bore:", "bore")),
    );
    let words = hover_text(&bore);
    for part in [
        "measurement, length per cylinder",
        "3.5 in to 4.5 in",
        "Dial bore gauge",
    ] {
        assert!(words.contains(part), "{words}");
    }
    // a unit after `±` on its line: the position counts `±` as one UTF-16 unit
    let pound = client.request(
        "textDocument/hover",
        at(&uri, &position_of(&text, "define scale_weight", "lb (k")),
    );
    let words = hover_text(&pound);
    // NIST SP 811 B.8: 1 lb (avoirdupois) = 4.535 923 7 E-01 kg exactly
    assert!(words.contains("1 lb = 0.45359237 kg exactly"), "{words}");

    // the list is defined in the included parts file
    let list = client.request(
        "textDocument/definition",
        at(
            &uri,
            &position_of(&text, "require head.casting in stock_heads", "stock_heads"),
        ),
    );
    let parts = demo.text("parts/tamsin-parts.rules");
    assert_eq!(list["result"]["uri"], demo.uri("parts/tamsin-parts.rules"));
    assert_eq!(
        list["result"]["range"]["start"],
        position_of(&parts, "approved list stock_heads", "stock_heads")
    );

    // the error fixed as typed: the diagnostics clear
    client.notify(
        "textDocument/didChange",
        json!({"textDocument": {"uri": uri, "version": 2},
               "contentChanges": [{"text": demo.text("tamsin-2027.rules")}]}),
    );
    assert_eq!(client.diagnostics(&uri), Vec::<Value>::new());
    client.stop();
}

#[test]
fn a_rule_hovers_as_explain_gives_it_and_names_are_found_everywhere() {
    let demo = DemoCopy::new("words");
    let uri = demo.uri("tamsin-2027.rules");
    let text = demo.text("tamsin-2027.rules");
    let mut client = Client::start();
    client.initialize();
    client.open(&uri, &text);
    assert_eq!(client.diagnostics(&uri), Vec::<Value>::new());

    let rule = client.request(
        "textDocument/hover",
        at(&uri, &position_of(&text, "rule 3.3 \"Compression", "3.3")),
    );
    let explained = common::gonogo(&[
        "explain",
        "--rules",
        "rulebooks-demo/tamsin-2027.rules",
        "--class",
        "street_stock",
        "3.3",
    ]);
    assert_eq!(explained.code, 0, "{}", explained.stderr);
    let words = hover_text(&rule);
    // the explanation's first line names the rule and its class, as `explain` does
    let first = explained
        .stdout
        .lines()
        .next()
        .or_panic("explain's first line");
    assert!(words.contains(first), "{words}\n---\n{}", explained.stdout);

    let derived = client.request(
        "textDocument/hover",
        at(&uri, &position_of(&text, "define gross_lift", "gross_lift")),
    );
    assert!(hover_text(&derived).contains("gross_lift = valve_lift(cam.lobe_lift, rocker.ratio)"));

    // every use of `compression`, its definition left out
    let refs = client.request(
        "textDocument/references",
        json!({"textDocument": {"uri": uri},
               "position": position_of(&text, "define compression", "compression"),
               "context": {"includeDeclaration": false}}),
    );
    let uses = text.matches("require compression").count();
    assert!(uses > 0);
    assert_eq!(
        refs["result"].as_array().map(Vec::len),
        Some(uses),
        "{refs}"
    );

    // completion after `in` offers the lists, after a number the units
    let line = position_of(&text, "require head.casting in stock_heads", "stock_heads");
    let lists = client.request("textDocument/completion", at(&uri, &line));
    let labels: Vec<&str> = lists["result"]
        .as_array()
        .or_panic("completion items")
        .iter()
        .filter_map(|i| i["label"].as_str())
        .collect();
    assert!(
        labels.contains(&"stock_heads") && labels.contains(&"banned_parts"),
        "{labels:?}"
    );
    assert!(!labels.contains(&"bore"), "{labels:?}");

    // the outline: classes with their rules by section
    let symbols = client.request(
        "textDocument/documentSymbol",
        json!({"textDocument": {"uri": uri}}),
    );
    let classes: Vec<&Value> = symbols["result"]
        .as_array()
        .or_panic("symbols")
        .iter()
        .filter(|s| s["kind"] == 5)
        .collect();
    assert_eq!(classes[0]["name"], "street_stock");
    let children = classes[0]["children"].as_array().or_panic("its rules");
    assert_eq!(children[0]["name"], "3.1 Displacement");

    // the demo has comments: the formatting keeps them (the printer `gonogo fmt` uses)
    let format = client.request(
        "textDocument/formatting",
        json!({"textDocument": {"uri": uri}, "options": {"tabSize": 2, "insertSpaces": true}}),
    );
    let edits = format["result"].as_array().or_panic("formatting edits");
    // the demo is not yet in canonical form (two long lines, entries two to a line), so there
    // is an edit to look at; an empty answer would leave this test asserting nothing
    assert_eq!(edits.len(), 1, "{format}");
    for edit in edits {
        let text = edit["newText"].as_str().or_panic("new text");
        assert!(text.contains("\n# "), "a comment is lost: {text}");
    }
    client.stop();
}

#[test]
fn a_problem_in_an_included_file_is_published_for_that_file() {
    let demo = DemoCopy::new("include");
    let parts_uri = demo.uri("parts/tamsin-parts.rules");
    let parts = demo.text("parts/tamsin-parts.rules").replacen(
        "/^TVH-23[0-9]{2}$/",
        "/^TVH-23[0-9{2}$/",
        1,
    );
    let mut client = Client::start();
    client.initialize();
    // the parts file has no `series` line: the rulebook including it is linted
    client.open(&parts_uri, &parts);
    let found = client.diagnostics(&parts_uri);
    assert_eq!(found.len(), 1, "{found:?}");
    assert_eq!(found[0]["code"], "C10");
    assert_eq!(
        found[0]["range"]["start"]["line"],
        position_of(&parts, "/^TVH-23[0-9{2}$/", "/")["line"]
    );
    client.stop();
}

/// Neovim's built-in client, as Debian packages it (`apt-get install neovim`).
fn nvim() -> Option<PathBuf> {
    ["/usr/bin/nvim", "/usr/local/bin/nvim"]
        .iter()
        .map(PathBuf::from)
        .find(|p| p.exists())
}

#[test]
#[ignore = "needs Neovim: run with `cargo test --test lsp -- --ignored` (.ci/run does)"]
fn neovim_shows_the_live_diagnostic_and_a_hover() {
    let Some(nvim) = nvim() else {
        panic!(
            "Neovim is not installed (Debian package `neovim`): the editor test cannot run. \
             `apt-get install -y neovim`, then `cargo test --test lsp -- --ignored`"
        );
    };
    let demo = DemoCopy::new("neovim");
    let file = demo.path("tamsin-2027.rules");
    std::fs::write(&file, planted(&demo.text("tamsin-2027.rules"))).or_panic("the planted copy");
    let results = demo.path("results.txt");
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/lsp/neovim.lua");
    let output = Command::new(nvim)
        .args(["--headless", "-u", "NONE", "-i", "NONE", "-n"])
        .env("GONOGO", env!("CARGO_BIN_EXE_gonogo"))
        .env("GONOGO_FILE", &file)
        .env("GONOGO_RESULTS", &results)
        .arg("-c")
        .arg(format!("luafile {}", script.display()))
        .stdin(Stdio::null())
        .output()
        .or_panic("Neovim started");
    let written = std::fs::read_to_string(&results).unwrap_or_else(|_| {
        panic!(
            "Neovim wrote no results: status {:?}\n{}\n{}",
            output.status.code(),
            String::from_utf8_lossy(&output.stdout),
            String::from_utf8_lossy(&output.stderr)
        )
    });
    let text = demo.text("tamsin-2027.rules");
    let line = text
        .lines()
        .position(|l| l.contains("compression <= 9.5 mm"))
        .or_panic("the planted line");
    assert!(
        written.contains(&format!("diagnostic C17 line {line}")),
        "{written}"
    );
    assert!(
        written.contains("cannot compare a plain number with a length"),
        "{written}"
    );
    assert!(
        written.contains("hover: **bore**: measurement, length per cylinder"),
        "{written}"
    );
}

/// Every reserved word of the lexer is highlighted as a keyword by the TextMate grammar.
#[test]
fn the_editor_grammar_has_every_keyword_of_the_lexer() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("editors/gonogo.tmLanguage.json");
    let grammar: Value =
        serde_json::from_str(&std::fs::read_to_string(path).or_panic("the grammar"))
            .or_panic("JSON");
    let pattern = grammar["repository"]["keyword"]["match"]
        .as_str()
        .or_panic("the keyword rule");
    let words: Vec<&str> = pattern
        .trim_start_matches("\\b(?:")
        .trim_end_matches(")\\b")
        .split('|')
        .collect();
    for keyword in gonogo::parse::KEYWORDS {
        assert!(
            words.contains(keyword),
            "`{keyword}` is not in the grammar's keywords"
        );
    }
}
