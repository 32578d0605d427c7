//! # rigwright-report
//!
//! The Sheet: a printable PDF summary of a rig, like a calc sheet an engineer signs, and the
//! CSV and JSON exports of the same results. Depends on `rigwright-core` only, never on the
//! desktop app, so it builds and tests without a window.
//!
//! Responsible for gathering the results from `rigwright-core` ([`Sheet::build`]), laying
//! them out on A4 or Letter pages and writing the PDF ([`Sheet::to_pdf`]), and for the export
//! files ([`export`]). Not responsible for any mechanics: every number comes from the core.
//! Used by the `sheet` and `export` commands and by the app's File menu.
//!
//! Also what the Sheet and the app's Rig view and Readouts both present: the projection of a
//! rig onto a drawing plane ([`plane`]), display units ([`units`]) and calendar dates
//! ([`date`]).

mod content;
pub mod date;
mod drawing;
pub mod export;
pub mod fonts;
pub mod format;
mod layout;
pub mod page;
pub mod plane;
mod table;
pub mod units;
mod warnings;

pub use content::{CaseChoice, MODE_COUNT, STOPPED, Sheet, SheetOptions, sha256_hex};
pub use date::today;
pub use layout::CAUTIONS;
pub use page::{Op, Page, Paper};

impl Sheet {
    /// The laid-out pages (display lists), for inspection.
    pub fn pages(&self, paper: Paper) -> Vec<Page> {
        layout::pages(self, paper)
    }

    /// The sheet as PDF bytes.
    pub fn to_pdf(&self, paper: Paper) -> Result<Vec<u8>, String> {
        self.pdf_of(&self.pages(paper), paper)
    }

    /// PDF bytes of pages already laid out with [`Sheet::pages`].
    pub fn pdf_of(&self, pages: &[Page], paper: Paper) -> Result<Vec<u8>, String> {
        let title = if self.project.title.is_empty() {
            "Rigwright sheet".to_string()
        } else {
            format!("{} — Rigwright sheet", self.project.title)
        };
        page::render(pages, paper, &title)
    }
}
