//! `gonogo units`: every unit gonogo reads, by dimension, with its exact factor. It reads no
//! file, so it cannot fail; the diagnostics for an unknown unit point here.

use crate::report::units::{UnitsFormat, render};

/// The listing of every unit in `format`.
pub fn run(format: UnitsFormat) -> String {
    render(format)
}
