//! Command-line entry: headless subcommands over project files.
//!
//! Exit codes: 0 solved, 2 bad input (message on stderr), 3 no valid equilibrium
//! (diagnostic on stderr); `check` and `autosize` exit 1 when a check fails.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{Parser, Subcommand};
use rigwright_core::{Equilibrium, Model, Project, SolveError, Statics};

mod dynamics;
mod report;
mod sheet_cmd;
pub mod sizing;

/// Exit code for bad input.
pub const EXIT_BAD_INPUT: u8 = 2;
/// Exit code when there is no valid equilibrium.
pub const EXIT_NO_EQUILIBRIUM: u8 = 3;

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
    },
}

/// Parses "DX,DY" or "DX,DY,DZ" (m).
fn parse_offset(text: &str) -> Result<rigwright_core::Vec3, Failure> {
    let parts: Result<Vec<f64>, _> = text.split(',').map(|p| p.trim().parse::<f64>()).collect();
    match parts.as_deref() {
        Ok([x, y]) => Ok(rigwright_core::Vec3::new(*x, *y, 0.0)),
        Ok([x, y, z]) => Ok(rigwright_core::Vec3::new(*x, *y, *z)),
        _ => Err(Failure::input(format!(
            "offset `{text}`: write two or three numbers in metres separated by commas, e.g. 0,-0.05"
        ))),
    }
}

/// Runs the command line and returns the process exit code: with a subcommand it runs
/// headless, without one it opens the window.
pub fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let _ = e.print();
            return if e.use_stderr() {
                ExitCode::from(EXIT_BAD_INPUT)
            } else {
                ExitCode::SUCCESS
            };
        }
    };
    let Some(command) = cli.command else {
        return match crate::gui::run(cli.file) {
            Ok(()) => ExitCode::SUCCESS,
            Err(e) => {
                eprintln!("rigwright: could not open the window: {e}");
                ExitCode::FAILURE
            }
        };
    };
    match run(command) {
        Ok(()) => ExitCode::SUCCESS,
        Err(Failure { code, message }) => {
            eprintln!("rigwright: {message}");
            ExitCode::from(code)
        }
    }
}

/// An error that ends the command, with its exit code.
#[derive(Debug)]
pub struct Failure {
    pub code: u8,
    pub message: String,
}

impl Failure {
    fn input(message: impl Into<String>) -> Self {
        Failure {
            code: EXIT_BAD_INPUT,
            message: message.into(),
        }
    }
}

fn load(path: &Path) -> Result<(Project, Model), Failure> {
    Project::load_model(path).map_err(|e| load_failure(path, &e))
}

/// A project file that could not be read or used, named once, with what to do about it.
pub(crate) fn load_failure(path: &Path, e: &rigwright_core::model::ProjectError) -> Failure {
    use rigwright_core::model::ProjectError;
    match e {
        // The message already names the file.
        ProjectError::Io { .. } => Failure::input(format!("{e}; check the file's name and folder")),
        _ => Failure::input(format!("{}: {e}", path.display())),
    }
}

fn case_index(model: &Model, case: Option<&str>) -> Result<usize, Failure> {
    match case {
        None => Ok(0),
        Some(name) => model
            .case_index(name)
            .ok_or_else(|| Failure::input(SolveError::UnknownCase(name.into(), case_list(model)).to_string())),
    }
}

/// Loads a project and resolves the load case (default: the first).
fn load_case(path: &Path, case: Option<&str>) -> Result<(Model, usize), Failure> {
    let (_, model) = load(path)?;
    let case = case_index(&model, case).map_err(|f| Failure::input(format!("{}: {}", path.display(), f.message)))?;
    Ok((model, case))
}

/// Prints a command's output; a JSON document ends with a newline.
fn print_output(text: &str, json: bool) {
    if json {
        emit(&format!("{text}\n"));
    } else {
        emit(text);
    }
}

/// Writes `text` to standard output. A reader that closed the pipe early (`| head`) ends the
/// program quietly and successfully; any other write error ends it with a message.
pub(crate) fn emit(text: &str) {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|()| out.flush()) {
        Ok(()) => {}
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => std::process::exit(0),
        Err(e) => {
            eprintln!("rigwright: could not write the output: {e}");
            std::process::exit(1)
        }
    }
}

fn case_list(model: &Model) -> String {
    model.cases.iter().map(|c| format!("`{}`", c.name)).collect::<Vec<_>>().join(", ")
}

/// Exit 1 with `why` unless `ok`.
fn checked(ok: bool, why: &str) -> Result<(), Failure> {
    if ok {
        Ok(())
    } else {
        Err(Failure {
            code: sizing::EXIT_CHECK_FAILED,
            message: why.to_string(),
        })
    }
}

/// Runs one subcommand.
pub fn run(command: Command) -> Result<(), Failure> {
    match command {
        Command::Check { file, catalogue, json } => {
            let (text, passes) = sizing::check_command(&file, &catalogue, json)?;
            print_output(&text, json);
            checked(passes, "not every check passes")
        }
        Command::Autosize {
            file,
            member,
            catalogue,
            only,
            output,
            json,
        } => {
            let (text, ok) = sizing::autosize_command(&file, &member, &catalogue, only.as_deref(), output.as_deref(), json)?;
            print_output(&text, json);
            checked(ok, "some cables cannot pass with the catalogue's parts")
        }
        Command::Sweep {
            file,
            param,
            from,
            to,
            steps,
            output,
            case,
            csv,
            json,
        } => {
            let text = sizing::sweep_command(&file, case.as_deref(), &param, (from, to, steps), &output, csv, json)?;
            print_output(&text, json);
            Ok(())
        }
        Command::Spring {
            rate,
            force,
            material,
            ends,
            max_od,
            min_id,
            max_free_length,
            design_factor,
            alpha,
            json,
        } => {
            let req = rigwright_core::sizing::SpringRequirement {
                rate,
                max_force: force,
                material: sizing::parse_material(&material)?,
                ends: sizing::parse_ends(&ends)?,
                max_outside_mm: max_od,
                min_inside_mm: min_id,
                max_free_length_mm: max_free_length,
                design_factor,
                buckling_alpha: alpha,
            };
            print_output(&sizing::spring_command(&req, json)?, json);
            Ok(())
        }
        Command::Parts { file, catalogue, filter } => {
            emit(&sizing::parts_command(file.as_deref(), &catalogue, filter.as_deref())?);
            Ok(())
        }
        Command::Sheet {
            file,
            output,
            case,
            paper,
            stiffness,
            catalogue,
            info,
        } => sheet_cmd::sheet(
            &file,
            &output,
            &paper,
            sheet_cmd::Choice {
                case,
                stiffness,
                catalogue,
            },
            info,
        ),
        Command::Export {
            file,
            case,
            csv_members,
            csv_nodes,
            json,
            stiffness,
            catalogue,
        } => sheet_cmd::export(
            &file,
            sheet_cmd::Choice {
                case,
                stiffness,
                catalogue,
            },
            sheet_cmd::Outputs {
                members: csv_members,
                nodes: csv_nodes,
                json,
            },
        ),
        Command::Modes { file, case, count, json } => {
            if count == 0 {
                return Err(Failure::input("--count 0: ask for at least one mode"));
            }
            let (model, case) = load_case(&file, case.as_deref())?;
            print_output(&dynamics::modes_command(&model, case, count, json)?, json);
            Ok(())
        }
        Command::Pluck {
            file,
            node,
            offset,
            duration,
            dt,
            damping,
            rho_inf,
            backbone,
            case,
            csv,
            json,
        } => {
            let (model, case) = load_case(&file, case.as_deref())?;
            let offset = parse_offset(&offset)?;
            let args = dynamics::PluckArgs {
                case,
                node: &node,
                offset,
                duration,
                dt,
                damping,
                rho_inf,
                backbone,
                csv: csv.as_deref(),
                json,
            };
            print_output(&dynamics::pluck_command(&model, &args)?, json);
            Ok(())
        }
        Command::Path {
            file,
            node,
            case,
            to,
            points,
            csv,
            json,
        } => {
            let (model, case) = load_case(&file, case.as_deref())?;
            let n = model
                .node_index(&node)
                .ok_or_else(|| Failure::input(format!("node `{node}` does not exist; check the id")))?;
            if !(2..=100_000).contains(&points) {
                return Err(Failure::input(format!("--points {points}: give 2 to 100000 points")));
            }
            if !(to.is_finite() && to > 0.0 && to <= 1e6) {
                return Err(Failure::input(format!("--to {to}: give a load factor above 0 and at most 1e6")));
            }
            let trace = Statics::new(&model).trace(case, n, to, points).map_err(|e| Failure {
                code: EXIT_NO_EQUILIBRIUM,
                message: e.to_string(),
            })?;
            print_output(&report::path_output(&trace, csv, json), json);
            if trace.reached {
                Ok(())
            } else {
                Err(Failure {
                    code: EXIT_NO_EQUILIBRIUM,
                    message: format!(
                        "the path stopped at load factor {} before reaching {to}",
                        rigwright_core::solve::sig6(trace.points.last().map_or(0.0, |p| p.load_factor))
                    ),
                })
            }
        }
        Command::Solve {
            file,
            case,
            json,
            stiffness,
            follow,
        } => {
            let (model, case) = load_case(&file, case.as_deref())?;
            let mut statics = Statics::new(&model);
            statics.settings.follow = follow;
            let node = match &stiffness {
                Some(id) => Some(
                    model
                        .node_index(id)
                        .ok_or_else(|| Failure::input(format!("node `{id}` does not exist; check the id")))?,
                ),
                None => None,
            };
            let result = statics.solve(case, None);
            let eq: Equilibrium = match result {
                Ok(eq) => eq,
                Err(e) => {
                    if json {
                        emit(&format!("{}\n", report::failure_json(&model, case, &e)));
                    }
                    return Err(Failure {
                        code: EXIT_NO_EQUILIBRIUM,
                        message: e.to_string(),
                    });
                }
            };
            let k = match node {
                Some(n) if eq.stability.is_stable() => Some(statics.node_stiffness(&eq, n).map_err(|e| Failure::input(e.to_string()))?),
                _ => None,
            };
            if json {
                emit(&format!("{}\n", report::solve_json(&eq, k.as_ref())));
            } else {
                emit(&report::solve_table(&model, &eq, k.as_ref()));
            }
            if !eq.stability.is_stable() {
                return Err(Failure {
                    code: EXIT_NO_EQUILIBRIUM,
                    message: eq.stability.describe(),
                });
            }
            Ok(())
        }
    }
}
