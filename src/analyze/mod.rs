//! The officials' and builders' analyses, built on evaluation: [`compare`] two checked
//! editions rule by rule (`gonogo diff`), [`impact`] a field of engines under two editions
//! (`gonogo impact`), and [`headroom`] how far each measured input of an engine may move before
//! a rule's verdict changes (`gonogo headroom`).

pub mod compare;
pub mod headroom;
pub mod impact;
pub mod sweep;
