//! Reports: the evaluated engine as one [`view::EngineView`], laid out as text, Markdown and
//! HTML for people and serialised as JSON for programs; and the reports of the other commands.

pub mod diff;
pub mod document;
pub mod explain;
pub mod format;
pub mod headroom;
pub mod html;
pub mod impact;
pub mod joint;
pub mod json;
pub mod markdown;
pub mod montecarlo;
pub mod provenance;
pub mod sheet;
pub mod sweep;
pub mod text;
pub mod units;
pub mod view;
