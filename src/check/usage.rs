//! Measurements and derived values declared and never read: warnings, since an inspector
//! would be asked to measure something no rule looks at.

use super::Checker;
use super::error::CheckError;

impl Checker<'_> {
    /// Warns about each measurement and derived value that nothing reads.
    pub(super) fn report_unused(&mut self) {
        let unused_measures: Vec<_> = self
            .measure_order
            .iter()
            .filter(|n| !self.used.contains(**n))
            .filter_map(|n| self.measures.get(n).map(|m| (n.to_string(), m.name.span)))
            .collect();
        for (name, at) in unused_measures {
            self.error(CheckError::UnusedMeasurement { name, at }.into());
        }
        let unused_defines: Vec<_> = self
            .define_order
            .iter()
            .filter(|n| !self.used.contains(**n))
            .filter_map(|n| self.defines.get(n).map(|d| (n.to_string(), d.name.span)))
            .collect();
        for (name, at) in unused_defines {
            self.error(CheckError::UnusedDefine { name, at }.into());
        }
    }
}
