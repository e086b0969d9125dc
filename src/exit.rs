//! Exit statuses of the `gonogo` command, as one enum (DESIGN.md section 7).

/// How a run ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Exit {
    /// Everything checked out.
    Clean = 0,
    /// At least one rule is illegal under the decision rule in force.
    Illegal = 1,
    /// The input could not be read: usage, syntax, a bad rulebook or declaration.
    BadInput = 2,
    /// Nothing illegal, but some finding is conditional or some rule was not checked.
    Uncertain = 3,
}

impl From<Exit> for std::process::ExitCode {
    fn from(exit: Exit) -> std::process::ExitCode {
        std::process::ExitCode::from(exit as u8)
    }
}
