//! `check`, `autosize`, `sweep`, `spring` and `parts`: the sizing commands.

use std::fmt::Write;
use std::path::{Path, PathBuf};

use rigwright_core::Project;
use rigwright_core::element::MemberClass;
use rigwright_core::sizing::{
    AutoSize, Catalogue, CheckReport, DesignFactors, Output, Param, SpringEnds, SpringMaterial, SpringRequirement, Status, SweepResult,
    auto_size, check_project, design_spring, project_catalogue, sweep,
};
use serde_json::json;

use super::load::{EXIT_BAD_INPUT, Failure, load_failure};

/// Exit code of `check` when any check fails or a case has no equilibrium.
pub const EXIT_CHECK_FAILED: u8 = 1;

fn read_project(path: &Path) -> Result<Project, Failure> {
    let p = Project::load(path).map_err(|e| load_failure(path, &e))?;
    p.validate().map_err(|e| Failure::input(format!("{}: {e}", path.display())))?;
    Ok(p)
}

/// The project's catalogue with extra catalogue files merged in.
fn catalogue(project: &Project, files: &[PathBuf]) -> Result<Catalogue, Failure> {
    Ok(project_catalogue(project, &catalogue_files(files)?))
}

/// The parts of catalogue files, in order.
pub(crate) fn catalogue_files(files: &[PathBuf]) -> Result<Catalogue, Failure> {
    let mut extra = Catalogue::default();
    for f in files {
        let c = Catalogue::load(f).map_err(|e| Failure::input(format!("{}: {e}", f.display())))?;
        extra.extend(c.parts().iter().cloned());
    }
    Ok(extra)
}

/// A force in newtons as printed in tables: kN above 10 kN.
pub fn force(n: f64) -> String {
    if n.abs() >= 1e4 {
        format!("{:.2} kN", n / 1000.0)
    } else {
        format!("{n:.1} N")
    }
}

fn quantity(v: f64, unit: &str) -> String {
    match unit {
        "N" => force(v),
        "Pa" => format!("{:.1} MPa", v / 1e6),
        "m" => format!("{:.1} mm", v * 1e3),
        _ => format!("{v:.4} {unit}"),
    }
}

fn class_label(c: MemberClass) -> String {
    format!("{} (DF default: {})", c.name(), DesignFactors::source(c))
}

/// `rigwright check`: the report as text or JSON, and whether everything passes.
pub fn check_command(path: &Path, catalogues: &[PathBuf], json: bool) -> Result<(String, bool), Failure> {
    let project = read_project(path)?;
    let cat = catalogue(&project, catalogues)?;
    let report = check_project(&project, &cat).map_err(|e| Failure::input(e.to_string()))?;
    let text = if json {
        check_json(&report)
    } else {
        check_table(&project, &report)
    };
    Ok((text, report.passes()))
}

fn check_json(report: &CheckReport) -> String {
    let doc = json!({
        "format": "rigwright.check/1",
        "units": {"force": "N", "stress": "Pa", "length": "m"},
        "passes": report.passes(),
        "report": report,
    });
    serde_json::to_string_pretty(&doc).expect("json")
}

fn check_table(project: &Project, r: &CheckReport) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Checks of {}", if project.title.is_empty() { "the rig" } else { &project.title });
    // The design factors of the kinds of member the rig has.
    for c in [MemberClass::Cable, MemberClass::Spring, MemberClass::Strut] {
        if r.members.iter().any(|m| m.class == c) {
            let _ = writeln!(s, "  design factor {}: {}", r.design_factors.of(c), class_label(c));
        }
    }
    let _ = writeln!(s, "  near limit above utilisation {}", r.near_limit);
    for c in &r.cases {
        match &c.error {
            None => {
                let _ = writeln!(s, "  case `{}`: stable equilibrium", c.name);
            }
            Some(e) => {
                let _ = writeln!(s, "  case `{}`: NO VALID EQUILIBRIUM, members not checked in it: {e}", c.name);
            }
        }
    }
    let _ = writeln!(
        s,
        "\n{:<14} {:<7} {:>22} {:>22} {:>12} {:>5} {:>7}  {:<12} governing",
        "member", "class", "min force [case]", "max force [case]", "capacity", "DF", "util", "status"
    );
    for m in &r.members {
        let env = |f: &Option<(f64, String)>| f.as_ref().map_or("-".to_string(), |(v, c)| format!("{} [{c}]", force(*v)));
        let gov = m.governing_line().map_or(String::new(), |l| {
            if l.case.is_empty() {
                l.check.to_string()
            } else {
                format!("{} in `{}`", l.check, l.case)
            }
        });
        let _ = writeln!(
            s,
            "{:<14} {:<7} {:>22} {:>22} {:>12} {:>5} {:>7}  {:<12} {}",
            m.id,
            m.class.name(),
            env(&m.force_min),
            env(&m.force_max),
            m.capacity.as_ref().map_or("-".into(), |c| quantity(c.value, c.unit)),
            m.design_factor,
            m.utilisation.map_or("-".into(), |u| format!("{u:.3}")),
            m.status.word(),
            gov
        );
        if let Some(made) = &m.made_of {
            let _ = writeln!(s, "    made of: {made}");
        }
        for l in &m.lines {
            let case = if l.case.is_empty() {
                String::new()
            } else {
                format!(" in `{}`", l.case)
            };
            let _ = writeln!(
                s,
                "    {}{case}: {} against {}{} — {}; {}",
                l.check,
                quantity(l.demand, l.unit),
                quantity(l.limit, l.unit),
                l.utilisation.map_or(String::new(), |u| format!(", utilisation {u:.3}")),
                l.status.word(),
                l.note
            );
        }
        for n in &m.notes {
            let _ = writeln!(s, "    note: {n}");
        }
    }
    let _ = writeln!(
        s,
        "\n{} pass, {} near limit, {} FAIL, {} not checked. {}",
        r.count(Status::Pass),
        r.count(Status::Near),
        r.count(Status::Fail),
        r.count(Status::NotChecked),
        match (r.passes(), r.count(Status::NotChecked)) {
            _ if r.members.is_empty() => "The rig has no members: nothing to check; add cables, springs or struts.".to_string(),
            (false, _) => "NOT ALL CHECKS PASS.".to_string(),
            (true, 0) => "All checks pass.".to_string(),
            (true, n) => format!("No check fails, but {n} member(s) have nothing to check against: give them a part, design or section."),
        }
    );
    let _ = writeln!(s, "{}", rigwright_core::CAUTION);
    s
}

/// `rigwright autosize`.
pub fn autosize_command(
    path: &Path,
    members: &[String],
    catalogues: &[PathBuf],
    only: Option<&str>,
    out: Option<&Path>,
    json: bool,
) -> Result<(String, bool), Failure> {
    let project = read_project(path)?;
    let mut cat = catalogue(&project, catalogues)?;
    if let Some(text) = only {
        cat = Catalogue::of(cat.parts().iter().filter(|p| p.id.contains(text)).cloned().collect());
        if cat.parts().is_empty() {
            return Err(Failure::input(format!(
                "no part id contains `{text}`; list them with `rigwright parts`"
            )));
        }
    }
    let a: AutoSize = auto_size(&project, &cat, members, 20).map_err(|e| Failure::input(e.to_string()))?;
    if let Some(out) = out {
        // The sized project is a new file: the one read stays as it was.
        if rigwright_core::model::same_file(path, out) {
            return Err(Failure::input(format!(
                "{}: this is the project being sized; write the sized project to another file",
                out.display()
            )));
        }
        rigwright_core::model::write_atomic(out, a.project.to_ron().as_bytes()).map_err(|e| Failure {
            code: EXIT_BAD_INPUT,
            message: e.to_string(),
        })?;
    }
    let ok = a.converged && a.failures.is_empty();
    if json {
        let doc = json!({"format": "rigwright.autosize/1", "result": a, "written": out.map(|p| p.display().to_string())});
        return Ok((serde_json::to_string_pretty(&doc).expect("json"), ok));
    }
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Auto-size: {} round(s), {}",
        a.iterations,
        if a.converged { "choice stable" } else { "choice NOT stable" }
    );
    for (m, part) in &a.choices {
        let desc = cat.find(part).map_or(String::new(), |p| {
            format!(
                "{}: F_min {}, EA {:.4e} N, {:.3} kg/m",
                p.description,
                force(p.breaking_force),
                p.ea,
                p.mass_per_length
            )
        });
        let _ = writeln!(s, "  {m:<14} {part:<22} {desc}");
    }
    for (m, why) in &a.failures {
        let _ = writeln!(s, "  CANNOT PASS: {m}: {why}");
    }
    let _ = writeln!(
        s,
        "Auto-size chooses for tension only; run `rigwright check` for slack and every other check."
    );
    match out {
        Some(p) => {
            let _ = writeln!(s, "Sized project written to {}; run `rigwright check` on it.", p.display());
        }
        None => {
            let _ = writeln!(s, "Nothing written; give -o FILE to save the sized project.");
        }
    }
    Ok((s, ok))
}

/// `rigwright sweep`.
pub fn sweep_command(
    path: &Path,
    case: Option<&str>,
    param: &str,
    range: (f64, f64, usize),
    outputs: &[String],
    csv: bool,
    json: bool,
) -> Result<String, Failure> {
    let project = read_project(path)?;
    let cat = catalogue(&project, &[])?;
    let param: Param = param.parse().map_err(Failure::input)?;
    let outputs: Vec<Output> = if outputs.is_empty() {
        vec![Output::PeakTension, Output::PeakUtilisation, Output::LowestFrequency]
    } else {
        outputs
            .iter()
            .map(|o| o.parse())
            .collect::<Result<_, _>>()
            .map_err(Failure::input)?
    };
    let r = sweep(&project, &cat, case, &param, range, &outputs).map_err(|e| Failure::input(e.to_string()))?;
    Ok(if json {
        serde_json::to_string_pretty(&json!({"format": "rigwright.sweep/1", "sweep": r})).expect("json")
    } else if csv {
        sweep_csv(&r)
    } else {
        sweep_table(&r)
    })
}

fn header(name: &str, unit: &str) -> String {
    if unit.is_empty() {
        name.to_string()
    } else {
        format!("{name} ({unit})")
    }
}

fn sweep_csv(r: &SweepResult) -> String {
    let mut s = String::new();
    let mut cols = vec![header(&r.param, r.unit)];
    cols.extend(r.outputs.iter().map(|(n, u)| header(n, u)));
    cols.push("note".into());
    let _ = writeln!(s, "{}", cols.iter().map(|c| format!("\"{c}\"")).collect::<Vec<_>>().join(","));
    for ((v, row), note) in r.values.iter().zip(&r.rows).zip(&r.notes) {
        let mut cells = vec![format!("{v}")];
        cells.extend(row.iter().map(|x| x.map_or(String::new(), |x| format!("{x}"))));
        cells.push(format!("\"{}\"", note.as_deref().unwrap_or("").replace('"', "'")));
        let _ = writeln!(s, "{}", cells.join(","));
    }
    s
}

fn sweep_table(r: &SweepResult) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Sweep of {} in case `{}`", header(&r.param, r.unit), r.case);
    let mut line = format!("{:>16}", header("value", r.unit));
    for (n, u) in &r.outputs {
        line += &format!(" {:>24}", header(n, u));
    }
    let _ = writeln!(s, "{line}");
    for ((v, row), note) in r.values.iter().zip(&r.rows).zip(&r.notes) {
        let mut line = format!("{v:>16.6}");
        for x in row {
            line += &format!(" {:>24}", x.map_or("—".to_string(), |x| format!("{x:.6}")));
        }
        if let Some(n) = note {
            line += &format!("  ({n})");
        }
        let _ = writeln!(s, "{line}");
    }
    s
}

/// Parses a spring material name.
pub fn parse_material(s: &str) -> Result<SpringMaterial, Failure> {
    Ok(match s {
        "music-wire" => SpringMaterial::MusicWire,
        "oil-tempered" => SpringMaterial::OilTempered,
        "hard-drawn" => SpringMaterial::HardDrawn,
        "chrome-vanadium" => SpringMaterial::ChromeVanadium,
        "chrome-silicon" => SpringMaterial::ChromeSilicon,
        "stainless-302" => SpringMaterial::Stainless302,
        _ => {
            return Err(Failure::input(format!(
                "material `{s}`: use music-wire, oil-tempered, hard-drawn, chrome-vanadium, chrome-silicon or stainless-302"
            )));
        }
    })
}

/// Parses a spring end type.
pub fn parse_ends(s: &str) -> Result<SpringEnds, Failure> {
    Ok(match s {
        "plain" => SpringEnds::Plain,
        "plain-ground" => SpringEnds::PlainGround,
        "squared" => SpringEnds::Squared,
        "squared-ground" => SpringEnds::SquaredGround,
        "extension" => SpringEnds::Extension,
        _ => {
            return Err(Failure::input(format!(
                "ends `{s}`: use plain, plain-ground, squared, squared-ground or extension"
            )));
        }
    })
}

/// `rigwright spring`: proposes a helical spring.
pub fn spring_command(req: &SpringRequirement, json: bool) -> Result<String, Failure> {
    let s = design_spring(req).map_err(Failure::input)?;
    let p = s.properties();
    if json {
        let doc = json!({"format": "rigwright.spring/1", "design": s, "properties": p});
        return Ok(serde_json::to_string_pretty(&doc).expect("json"));
    }
    let mut out = String::new();
    let _ = writeln!(out, "Proposed spring ({}), {} ends", s.material.name(), s.ends.name());
    let _ = writeln!(out, "  wire diameter d        {} mm", s.wire_mm);
    let _ = writeln!(
        out,
        "  mean coil diameter D   {} mm (outside {:.2} mm)",
        s.mean_mm,
        p.outside_diameter * 1e3
    );
    let _ = writeln!(out, "  active coils Na        {}", s.active_coils);
    let _ = writeln!(out, "  free length L0         {:.2} mm", s.free_length_mm);
    let _ = writeln!(out, "  solid length Ls        {:.2} mm", p.solid_length * 1e3);
    let _ = writeln!(out, "  rate k                 {:.1} N/m ({:.3} N/mm)", p.rate, p.rate / 1e3);
    let _ = writeln!(out, "  index C                {:.2}", p.index);
    let _ = writeln!(out, "  Bergsträsser KB        {:.4}", p.kb);
    let _ = writeln!(
        out,
        "  stress at {:<12}{:.1} MPa",
        force(req.max_force),
        s.stress(req.max_force) / 1e6
    );
    let _ = writeln!(out, "  Sut = A/d^m            {:.1} MPa", p.sut / 1e6);
    let _ = writeln!(out, "  allowable (solid)      {:.1} MPa", p.allowable / 1e6);
    let _ = writeln!(
        out,
        "  utilisation at force   {:.3} (with design factor {})",
        s.stress(req.max_force) * req.design_factor / p.allowable,
        req.design_factor
    );
    if s.ends.is_compression() {
        let solid = p.rate * (s.free_length_mm * 1e-3 - p.solid_length);
        let _ = writeln!(
            out,
            "  utilisation at solid   {:.3} ({} at solid; the designer sizes for this)",
            s.stress(solid) * req.design_factor / p.allowable,
            force(solid)
        );
    } else {
        let _ = writeln!(
            out,
            "  initial tension        {} (set; hooks not checked)",
            force(s.initial_tension)
        );
    }
    let _ = writeln!(out, "  mass                   {:.4} kg", p.mass);
    let _ = writeln!(out, "  surge frequency        {:.1} Hz", p.surge_hz);
    if let Some(l) = p.buckling_free_length {
        let _ = writeln!(
            out,
            "  buckling-free up to    {:.1} mm free length (α = {})",
            l * 1e3,
            s.buckling_alpha
        );
    }
    if let Some((lo, hi)) = p.initial_tension {
        let _ = writeln!(out, "  initial tension band   {} to {}", force(lo), force(hi));
    }
    let _ = writeln!(
        out,
        "Formulas: Shigley's Mechanical Engineering Design, ch. 10. {}",
        rigwright_core::CAUTION
    );
    Ok(out)
}

/// `rigwright parts`: the catalogue, filtered by text.
pub fn parts_command(path: Option<&Path>, catalogues: &[PathBuf], filter: Option<&str>) -> Result<String, Failure> {
    let project = match path {
        Some(p) => read_project(p)?,
        None => Project::new(""),
    };
    let cat = catalogue(&project, catalogues)?;
    let mut s = String::new();
    let _ = writeln!(s, "{:<24} {:>12} {:>14} {:>10}  description", "id", "F_min", "EA (N)", "kg/m");
    for p in cat.by_weight() {
        if filter.is_some_and(|f| !p.id.contains(f) && !p.description.contains(f)) {
            continue;
        }
        let _ = writeln!(
            s,
            "{:<24} {:>12} {:>14.4e} {:>10.4}  {}",
            p.id,
            force(p.breaking_force),
            p.ea,
            p.mass_per_length,
            p.description
        );
    }
    Ok(s)
}
