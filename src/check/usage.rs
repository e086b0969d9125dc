//! Measurements and derived values declared and never read: warnings, since an inspector
//! would be asked to measure something no rule looks at.

use super::Checker;
use crate::diagnostic::Problem;

impl Checker<'_> {
    /// Warns about each measurement and derived value that nothing reads.
    pub(super) fn report_unused(&mut self) {
        let unused_measures: Vec<_> = self
            .measure_order
            .iter()
            .filter(|n| !self.used.contains(**n))
            .filter_map(|n| self.measures.get(n).map(|m| (n.to_string(), m.name.span)))
            .collect();
        for (name, span) in unused_measures {
            self.error(
                Problem::warning(
                    "gonogo::check::unused-measurement",
                    format!("`{name}` is measured but no rule reads it"),
                    span,
                    "never used",
                )
                .with_help("remove it from the schema, or write the rule that needs it"),
            );
        }
        let unused_defines: Vec<_> = self
            .define_order
            .iter()
            .filter(|n| !self.used.contains(**n))
            .filter_map(|n| self.defines.get(n).map(|d| (n.to_string(), d.name.span)))
            .collect();
        for (name, span) in unused_defines {
            self.error(
                Problem::warning(
                    "gonogo::check::unused-define",
                    format!("`{name}` is defined but no rule reads it"),
                    span,
                    "never used",
                )
                .with_help("remove the definition, or use it in a rule"),
            );
        }
    }
}
