//! Words and pictures: the findings of every report as text, Markdown, HTML and CSV, and its
//! figures as SVG.

pub mod doc;
pub mod plot;
pub mod report;
pub mod words;
