//! The Recover / Discard question, while a recovery copy from an earlier session waits: the
//! copy opened as an unsaved document, or set aside once as `discarded-…`.

use std::path::Path;
use std::time::SystemTime;

use eframe::egui;
use rigwright_core::model::backup_path;
use rigwright_report::date::civil_from_days;

use super::discarded_path;
use crate::gui::{Document, RigApp};

/// The Recover / Discard question, while a copy from an earlier session waits.
pub fn offer_modal(app: &mut RigApp, ctx: &egui::Context) {
    let Some(offer) = app.recovery.offer.as_ref() else {
        return;
    };
    let name = offer.name();
    let when = offer.kept.map(describe_time).unwrap_or_else(|| "at an unknown time".into());
    let mut answer = None;
    egui::Modal::new(egui::Id::unique("recovery-offer")).show(ctx, |ui| {
        ui.heading("Recover unsaved changes?");
        ui.label(format!(
            "Rigwright did not close cleanly last time. Unsaved changes to `{name}` were kept {when}."
        ));
        if let Some(s) = &offer.source {
            ui.label(format!("Project file: {}", s.display()));
        }
        ui.label(format!("Recovery copy: {}", offer.file.display()));
        if let Err(e) = &offer.project {
            ui.colored_label(
                ui.visuals().error_fg_color,
                format!(
                    "The copy cannot be read: {e}. Discard keeps it as {} for a look by hand.",
                    discarded_path(&offer.file).display()
                ),
            );
        }
        ui.add_space(8.0);
        ui.horizontal(|ui| {
            let can = offer.project.is_ok();
            if ui
                .add_enabled(can, egui::Button::new("Recover"))
                .on_hover_text("Open the recovered changes; save them to keep them")
                .clicked()
            {
                answer = Some(true);
            }
            if ui
                .button("Discard")
                .on_hover_text(format!(
                    "Keep the current project; the copy is kept once as {}",
                    discarded_path(&offer.file).display()
                ))
                .clicked()
            {
                answer = Some(false);
            }
        });
    });
    match answer {
        Some(true) => recover(app),
        Some(false) => discard(app),
        None => {}
    }
}

/// Opens the offered copy as an unsaved document (the copy stays until it is saved).
pub fn recover(app: &mut RigApp) {
    let Some(offer) = app.recovery.offer.take() else { return };
    let Ok(project) = offer.project else {
        app.recovery.offer = Some(offer);
        return;
    };
    let source = offer.source.filter(|p| p.parent().is_some_and(Path::exists));
    // A copy of a document that was mid-edit may not be valid; open it as an edit then, so
    // its problems are listed rather than refused.
    let doc = match Document::open(project.clone(), source.clone()) {
        Ok(mut d) => {
            d.dirty = true;
            d
        }
        Err(_) => {
            let mut d = Document::empty();
            d.edit(None, move |p| *p = project);
            d.path = source;
            d
        }
    };
    app.replace_document(doc);
    // The copy on disk is this session's now: kept until the document is saved.
    app.recovery.on_disk = true;
    app.message = Some((
        format!("Recovered unsaved changes to `{}`; save to keep them", app.doc.name()),
        false,
    ));
}

/// Sets the offered copy aside (as [`DISCARDED_FILE`] for the first slot) and keeps the
/// current project.
pub fn discard(app: &mut RigApp) {
    let Some(offer) = app.recovery.offer.take() else { return };
    let aside = discarded_path(&offer.file);
    match std::fs::rename(&offer.file, &aside) {
        Ok(()) => {
            let _ = std::fs::remove_file(backup_path(&offer.file));
            app.message = Some((format!("Discarded the recovery copy (kept once as {})", aside.display()), false));
        }
        Err(e) => {
            app.message = Some((
                format!(
                    "Could not set the recovery copy {} aside: {e}; remove it by hand if it is not needed",
                    offer.file.display()
                ),
                true,
            ))
        }
    }
}

/// "on 2025-03-04 at 10:22 UTC (5 min ago)".
fn describe_time(t: SystemTime) -> String {
    let Ok(since_epoch) = t.duration_since(SystemTime::UNIX_EPOCH) else {
        return "at an unknown time".into();
    };
    let secs = since_epoch.as_secs();
    let (y, m, d) = civil_from_days((secs / 86_400) as i64);
    let (hh, mm) = ((secs % 86_400) / 3600, (secs % 3600) / 60);
    let ago = match SystemTime::now().duration_since(t).map(|d| d.as_secs()) {
        Ok(s) if s < 60 => "just now".to_string(),
        Ok(s) if s < 3600 => format!("{} min ago", s / 60),
        Ok(s) if s < 48 * 3600 => format!("{} h ago", s / 3600),
        Ok(s) => format!("{} days ago", s / 86_400),
        Err(_) => "in the future; check the clock".to_string(),
    };
    format!("on {y:04}-{m:02}-{d:02} at {hh:02}:{mm:02} UTC ({ago})")
}
