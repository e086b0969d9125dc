//! Reports: the same evaluated data rendered as text for people and as JSON for programs.

pub mod diff;
pub mod explain;
pub mod format;
pub mod headroom;
pub mod html;
pub mod impact;
pub mod json;
pub mod markdown;
pub mod sheet;
pub mod text;
