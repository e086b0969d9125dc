//! `season`: reading a season log back. `list` gives the inspections a filter lets through,
//! `history` one engine's inspections with what changed between them, `verify` checks the
//! chain and checks every inspection again (exit 1 when anything differs), `export` writes
//! every stored declaration and rulebook back out as files.

use std::path::Path;

use super::Failure;
use crate::diagnostic::{Problem, codes};
use crate::exit::Exit;
use crate::season::query::Filter;
use crate::season::schema::{Log, Mode};
use crate::season::show::{self, HistoryFormat, ListFormat};

fn open(path: &Path) -> Result<Log, Failure> {
    Log::open(path, Mode::Existing).map_err(Failure::one)
}

/// `season list`: the inspections `filter` lets through, in the order recorded.
pub fn list(path: &Path, filter: &Filter, format: ListFormat) -> Result<String, Failure> {
    filter.validate().map_err(Failure::one)?;
    let rows = open(path)?.list(filter).map_err(Failure::one)?;
    Ok(show::list(&rows, format))
}

/// `season history`: every inspection of `engine`; refused when the log has none.
pub fn history(path: &Path, engine: &str, format: HistoryFormat) -> Result<String, Failure> {
    let rows = open(path)?.history(engine).map_err(Failure::one)?;
    if rows.is_empty() {
        return Err(Failure::one(
            Problem::unlocated(
                codes::log::NO_INSPECTION,
                format!("the season log has no inspection of engine `{engine}`"),
            )
            .with_help("`gonogo season list LOG` shows the engines recorded"),
        ));
    }
    Ok(show::history(engine, &rows, format))
}

/// `season verify`: the report, and exit 1 when the chain is broken or a call would differ.
pub fn verify(path: &Path) -> Result<(String, Exit), Failure> {
    let log = open(path)?;
    let verification = crate::season::verify::verify(&log).map_err(Failure::one)?;
    let exit = if verification.clean() {
        Exit::Clean
    } else {
        Exit::Illegal
    };
    Ok((
        show::verification(&path.display().to_string(), &verification),
        exit,
    ))
}

/// `season export`: the files written, one a line; nothing when any already exists.
pub fn export(path: &Path, folder: &Path) -> Result<String, Failure> {
    let files = crate::season::export::export(&open(path)?, folder).map_err(Failure::one)?;
    let mut out = format!("{} file(s) written:\n", files.len());
    for (file, _) in &files {
        out.push_str(&format!("  {}\n", file.display()));
    }
    Ok(out)
}
