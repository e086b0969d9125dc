//! Exit statuses of the `gonogo` command, as one enum (DESIGN.md section 7); an engine's
//! status is derived from its [`EngineResult`].

use crate::evaluate::outcome::EngineResult;

/// How a run ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Exit {
    /// Everything checked out.
    Clean = 0,
    /// At least one rule is illegal under the decision rule in force; for `lint`, a rulebook
    /// has an error ([`Exit::ERRORS_FOUND`]).
    Illegal = 1,
    /// The input could not be read (usage, syntax, a bad rulebook or declaration), or the
    /// output could not be written (a full disk, a refused `--output`); for `lint`, a file
    /// named could not be read at all.
    BadInput = 2,
    /// Nothing illegal, but some finding is conditional or some rule was not checked.
    Uncertain = 3,
}

impl Exit {
    /// `lint` ran and found an error in a rulebook: status 1, as an illegal rule is for
    /// `check` (the run worked and the answer is no); 2 stays for a run that could not work.
    pub const ERRORS_FOUND: Exit = Exit::Illegal;
}

impl From<EngineResult> for Exit {
    /// The status an engine's result calls for; every result has its own.
    fn from(result: EngineResult) -> Exit {
        match result {
            EngineResult::Legal => Exit::Clean,
            EngineResult::Illegal => Exit::Illegal,
            EngineResult::NotAllClear => Exit::Uncertain,
        }
    }
}

impl From<Exit> for std::process::ExitCode {
    fn from(exit: Exit) -> std::process::ExitCode {
        std::process::ExitCode::from(exit as u8)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn each_result_has_its_own_status() {
        // README "Exit status": 0 legal, 1 illegal, 3 not all clear
        assert_eq!(Exit::from(EngineResult::Legal) as u8, 0);
        assert_eq!(Exit::from(EngineResult::Illegal) as u8, 1);
        assert_eq!(Exit::from(EngineResult::NotAllClear) as u8, 3);
    }
}
