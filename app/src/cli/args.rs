//! The command line's arguments: the subcommands and their options, as clap parses them
//! (their doc comments are the `--help` text).

use std::path::PathBuf;

use clap::{Parser, Subcommand};

use super::sheet_cmd;

#[derive(Parser, Debug)]
#[command(
    name = "rigwright",
    version,
    about = "Large-displacement statics of cable-and-spring rigs",
    after_help = "Exit codes: 0 done; 1 a member fails a check (check, autosize); 2 bad input (the message says what and where); 3 a load case has no equilibrium (solve, modes, pluck; sheet and export still write their files, which say so).\n\nRigging can hurt people: results are a design aid for qualified persons and do not replace local codes, manufacturers' ratings or review by a licensed engineer."
)]
#[command(args_conflicts_with_subcommands = true)]
pub struct Cli {
    /// Project file (*.rig.ron) to open in the window; without it the last project reopens.
    pub file: Option<PathBuf>,
    /// A headless subcommand; without one the window opens.
    #[command(subcommand)]
    pub command: Option<Command>,
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Solve the static equilibrium of a load case and print member forces and reactions.
    Solve {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Load case name (default: the first case).
        #[arg(long)]
        case: Option<String>,
        /// Print one JSON document (SI units) instead of tables.
        #[arg(long)]
        json: bool,
        /// Also print the condensed tangent stiffness at this node.
        #[arg(long)]
        stiffness: Option<String>,
        /// When the load path meets a limit point or bifurcation (or the drawn state is
        /// unstable), follow the rig to the stable state it moves to instead of stopping there;
        /// the output says so.
        #[arg(long)]
        follow: bool,
    },
    /// Trace the load path: load factor against one node's displacement, through limit
    /// points and unstable stretches, by arc length from the unloaded state.
    Path {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Node whose displacement to record.
        #[arg(long)]
        node: String,
        /// Load case name (default: the first case).
        #[arg(long)]
        case: Option<String>,
        /// Load factor to trace up to (1 = the full load case).
        #[arg(long, default_value_t = 1.0)]
        to: f64,
        /// Most path points to record (2 to 100,000).
        #[arg(long, default_value_t = 400)]
        points: usize,
        /// Print CSV.
        #[arg(long, conflicts_with = "json")]
        csv: bool,
        /// Print one JSON document (SI units).
        #[arg(long)]
        json: bool,
    },
    /// Natural frequencies and mode shapes about the equilibrium of a load case.
    Modes {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Load case name (default: the first case).
        #[arg(long)]
        case: Option<String>,
        /// Number of modes (lowest first).
        #[arg(long, default_value_t = 6)]
        count: usize,
        /// Links each sagging cable is cut into so that its own mass vibrates (default: from
        /// the frequencies asked for, 8 to 64; 1 lumps each cable's mass at its ends).
        #[arg(long)]
        cable_links: Option<usize>,
        /// Print one JSON document (SI units).
        #[arg(long)]
        json: bool,
    },
    /// Pull a node, release it and follow the nonlinear free vibration.
    Pluck {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Node to pull.
        #[arg(long)]
        node: String,
        /// Pull offset in metres, "DX,DY" or "DX,DY,DZ".
        #[arg(long, allow_hyphen_values = true)]
        offset: String,
        /// Time to follow (s).
        #[arg(long)]
        duration: f64,
        /// Time step (s); default 1/200 of the lowest natural period, at most 1 ms.
        #[arg(long)]
        dt: Option<f64>,
        /// Damping ratio at the two lowest natural frequencies (Rayleigh), e.g. 0.02.
        #[arg(long)]
        damping: Option<f64>,
        /// Numerical dissipation: generalized-α with this spectral radius (0–1) instead of
        /// the energy-conserving scheme.
        #[arg(long)]
        rho_inf: Option<f64>,
        /// Also pluck at this many growing amplitudes up to the offset (backbone curve).
        #[arg(long)]
        backbone: Option<usize>,
        /// Links each sagging cable is cut into so that its own mass moves (default 16; 1
        /// lumps each cable's mass at its ends).
        #[arg(long)]
        cable_links: Option<usize>,
        /// Load case name (default: the first case).
        #[arg(long)]
        case: Option<String>,
        /// Write the time histories to this CSV file.
        #[arg(long)]
        csv: Option<PathBuf>,
        /// Print one JSON document (SI units) with the histories.
        #[arg(long)]
        json: bool,
    },
    /// Check every member in every load case: tension, slack, spring stress and solid length,
    /// strut buckling. Exit 0 when all pass, 1 when any fails, 2 on bad input.
    Check {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Extra catalogue file(s) (*.parts.ron) to find parts in.
        #[arg(long)]
        catalogue: Vec<PathBuf>,
        /// Print one JSON document (SI units).
        #[arg(long)]
        json: bool,
    },
    /// Choose the lightest catalogue part for cables that passes every case, re-solving until
    /// the choice is stable.
    Autosize {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Cable to size (repeat; default: every cable).
        #[arg(long)]
        member: Vec<String>,
        /// Extra catalogue file(s) (*.parts.ron).
        #[arg(long)]
        catalogue: Vec<PathBuf>,
        /// Choose only among parts whose id contains this text, e.g. `6x19-IWRC` or `-1770`.
        #[arg(long)]
        only: Option<String>,
        /// Write the sized project here.
        #[arg(short, long)]
        output: Option<PathBuf>,
        /// Print one JSON document.
        #[arg(long)]
        json: bool,
    },
    /// Vary one parameter over a range and tabulate outputs.
    Sweep {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// member:ID:pretension | member:ID:rate | member:ID:ea | node:ID:x|y|z | node:ID:mass |
        /// load:CASE:NODE:x|y|z
        #[arg(long)]
        param: String,
        /// First value (SI).
        #[arg(long, allow_hyphen_values = true)]
        from: f64,
        /// Last value (SI).
        #[arg(long, allow_hyphen_values = true)]
        to: f64,
        /// Number of values, at least 2.
        #[arg(long, default_value_t = 11)]
        steps: usize,
        /// Output (repeat): lowest-frequency, peak-tension, peak-utilisation,
        /// displacement:NODE[:x|y|z], stiffness:NODE:x|y|z, force:MEMBER.
        #[arg(long)]
        output: Vec<String>,
        /// Load case name (default: the first case).
        #[arg(long)]
        case: Option<String>,
        /// Print CSV.
        #[arg(long, conflicts_with = "json")]
        csv: bool,
        /// Print one JSON document.
        #[arg(long)]
        json: bool,
    },
    /// Propose a helical spring for a rate and working force (Shigley ch. 10 formulas).
    Spring {
        /// Rate (N/m).
        #[arg(long)]
        rate: f64,
        /// Largest working force (N).
        #[arg(long)]
        force: f64,
        /// music-wire, oil-tempered, hard-drawn, chrome-vanadium, chrome-silicon, stainless-302.
        #[arg(long, default_value = "oil-tempered")]
        material: String,
        /// plain, plain-ground, squared, squared-ground, extension.
        #[arg(long, default_value = "squared-ground")]
        ends: String,
        /// Largest outside diameter (mm).
        #[arg(long)]
        max_od: Option<f64>,
        /// Smallest inside diameter (mm).
        #[arg(long)]
        min_id: Option<f64>,
        /// Longest free length (mm).
        #[arg(long)]
        max_free_length: Option<f64>,
        /// Design factor on the allowable stress.
        #[arg(long, default_value_t = 1.2)]
        design_factor: f64,
        /// End-condition constant of the buckling check: 1 pivoted ends, 0.5 flat parallel ends.
        #[arg(long, default_value_t = 1.0)]
        alpha: f64,
        /// Print one JSON document.
        #[arg(long)]
        json: bool,
    },
    /// List catalogue parts (built-in ropes, a project's own parts, catalogue files).
    Parts {
        /// Project whose own parts to include.
        file: Option<PathBuf>,
        /// Extra catalogue file(s) (*.parts.ron).
        #[arg(long)]
        catalogue: Vec<PathBuf>,
        /// Show only ids or descriptions containing this text.
        #[arg(long)]
        filter: Option<String>,
    },
    /// Write the Sheet: a printable PDF summary (title block, drawing, member checks across all
    /// load cases, nodes, natural frequencies, warnings, cautions).
    Sheet {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// PDF file to write.
        #[arg(short, long)]
        output: PathBuf,
        /// Load case drawn and tabulated (default: the governing case).
        #[arg(long)]
        case: Option<String>,
        /// Paper size: a4 or letter.
        #[arg(long, default_value = "a4")]
        paper: String,
        /// List the tangent stiffness at this node (repeat for more nodes).
        #[arg(long)]
        stiffness: Vec<String>,
        /// Extra catalogue file(s) (*.parts.ron) to find parts in, as for `check`.
        #[arg(long)]
        catalogue: Vec<PathBuf>,
        /// Dimension the sag of every cable that sags under its own weight on the drawing.
        #[arg(long)]
        sag: bool,
        /// Replace an existing project file (*.rig.ron) named as the output all the same.
        #[arg(long)]
        force: bool,
        #[command(flatten)]
        info: sheet_cmd::InfoArgs,
    },
    /// Write result files: members and nodes as CSV, the full result as JSON (SI units).
    Export {
        /// Project file (*.rig.ron).
        file: PathBuf,
        /// Load case of the node table and of the members' force columns (default: the
        /// governing case).
        #[arg(long)]
        case: Option<String>,
        /// Members CSV to write (checks across all cases, force in the chosen case).
        #[arg(long)]
        csv_members: Option<PathBuf>,
        /// Nodes CSV to write (positions, displacements, reactions in the chosen case).
        #[arg(long)]
        csv_nodes: Option<PathBuf>,
        /// JSON file to write (`rigwright.result/1`: every case, every check); `-` prints it.
        #[arg(long)]
        json: Option<PathBuf>,
        /// Also give the tangent stiffness at this node in the JSON (repeat for more).
        #[arg(long)]
        stiffness: Vec<String>,
        /// Extra catalogue file(s) (*.parts.ron) to find parts in, as for `check`.
        #[arg(long)]
        catalogue: Vec<PathBuf>,
        /// Replace an existing project file (*.rig.ron) named as an output all the same.
        #[arg(long)]
        force: bool,
    },
}
