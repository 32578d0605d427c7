//! What the checks report: the status of a check, the equilibrium of each load case, each
//! check line of each member, a member's checks and the report of a whole project. Plain
//! result values; the checks that fill them are `check.rs` and `member_checks.rs`.

use serde::Serialize;

use super::design::DesignFactors;
use crate::element::MemberClass;
use crate::solve::Equilibrium;

/// Outcome of a check, member or line. Shown with its word, never by colour alone.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Status {
    Pass,
    /// Passes, with utilisation above the project's near-limit fraction.
    Near,
    Fail,
    /// Nothing to check against (no part, design or section given).
    NotChecked,
}

impl Status {
    /// The word shown in tables.
    pub fn word(self) -> &'static str {
        match self {
            Status::Pass => "pass",
            Status::Near => "near limit",
            Status::Fail => "FAIL",
            Status::NotChecked => "not checked",
        }
    }
}

/// The equilibrium of one load case, or why there is none.
#[derive(Debug, Clone, Serialize)]
pub struct CaseOutcome {
    pub name: String,
    /// The stable equilibrium; `None` when the case did not give one.
    #[serde(skip)]
    pub equilibrium: Option<Equilibrium>,
    /// Why there is no usable equilibrium.
    pub error: Option<String>,
}

/// One check of one member in one case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CheckLine {
    /// "tension", "slack", "stress", "solid length", "buckling", "capacity", "direction".
    pub check: &'static str,
    /// Governing load case (empty for checks that do not depend on the load).
    pub case: String,
    /// What the member must carry, in `unit`.
    pub demand: f64,
    /// What it can carry after the design factor and efficiency, in `unit`.
    pub limit: f64,
    /// "N", "Pa" or "m".
    pub unit: &'static str,
    /// demand ÷ limit where that is meaningful.
    pub utilisation: Option<f64>,
    pub status: Status,
    /// The formula or the reason, as printed.
    pub note: String,
}

/// What a member's capacity is, for tables.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Capacity {
    pub value: f64,
    pub unit: &'static str,
    /// "minimum breaking force", "allowable stress", "Euler load".
    pub what: &'static str,
}

/// Every check of one member.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberCheck {
    pub id: String,
    pub class: MemberClass,
    /// Catalogue entry or design, as printed.
    pub made_of: Option<String>,
    /// Smallest axial force over the solved cases (N) and its case.
    pub force_min: Option<(f64, String)>,
    /// Largest axial force over the solved cases (N) and its case.
    pub force_max: Option<(f64, String)>,
    pub capacity: Option<Capacity>,
    pub design_factor: f64,
    /// Termination efficiency of a cable.
    pub efficiency: Option<f64>,
    /// Largest utilisation of any check.
    pub utilisation: Option<f64>,
    pub status: Status,
    /// Index into `lines` of the governing check.
    pub governing: Option<usize>,
    pub lines: Vec<CheckLine>,
    /// Why it was not checked, or what to look at.
    pub notes: Vec<String>,
}

impl MemberCheck {
    /// The governing line.
    pub fn governing_line(&self) -> Option<&CheckLine> {
        self.governing.map(|i| &self.lines[i])
    }
}

/// The checks of a whole project.
#[derive(Debug, Clone, Serialize)]
pub struct CheckReport {
    pub cases: Vec<CaseOutcome>,
    pub members: Vec<MemberCheck>,
    pub design_factors: DesignFactors,
    pub near_limit: f64,
}

impl CheckReport {
    /// True when every case has a stable equilibrium and no member fails.
    pub fn passes(&self) -> bool {
        self.cases.iter().all(|c| c.error.is_none()) && self.members.iter().all(|m| m.status != Status::Fail)
    }

    /// Member indices in order of concern: failing first, then by utilisation, highest first
    /// (whatever the status), those without one last; the project's order among equals.
    pub fn members_by_concern(&self) -> Vec<usize> {
        let members = &self.members;
        let mut order: Vec<usize> = (0..members.len()).collect();
        order.sort_by(|&a, &b| {
            let fails = |i: usize| members[i].status == Status::Fail;
            let u = |i: usize| members[i].utilisation.unwrap_or(f64::NEG_INFINITY);
            fails(b).cmp(&fails(a)).then_with(|| u(b).total_cmp(&u(a)))
        });
        order
    }

    /// Number of members with each status.
    pub fn count(&self, status: Status) -> usize {
        self.members.iter().filter(|m| m.status == status).count()
    }

    /// Largest utilisation of any member.
    pub fn peak_utilisation(&self) -> Option<f64> {
        self.members.iter().filter_map(|m| m.utilisation).reduce(f64::max)
    }
}
