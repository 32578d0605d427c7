//! Command-line entry: headless subcommands over project files.
//!
//! Exit codes: 0 solved, 2 bad input (message on stderr), 3 no valid equilibrium
//! (diagnostic on stderr); `check` and `autosize` exit 1 when a check fails.

use std::process::ExitCode;

use clap::Parser;
use rigwright_core::{Equilibrium, Statics};

mod args;
mod dynamics;
mod load;
mod report;
mod sheet_cmd;
pub mod sizing;

pub use args::{Cli, Command};
use load::load_case;
pub use load::{EXIT_BAD_INPUT, EXIT_NO_EQUILIBRIUM, Failure};

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
            sag,
            force,
            info,
        } => sheet_cmd::sheet(
            &file,
            &output,
            &paper,
            sheet_cmd::Choice {
                case,
                stiffness,
                catalogue,
                sag,
                force,
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
            force,
        } => sheet_cmd::export(
            &file,
            sheet_cmd::Choice {
                case,
                stiffness,
                catalogue,
                sag: false,
                force,
            },
            sheet_cmd::Outputs {
                members: csv_members,
                nodes: csv_nodes,
                json,
            },
        ),
        Command::Modes {
            file,
            case,
            count,
            cable_links,
            json,
        } => {
            if count == 0 {
                return Err(Failure::input("--count 0: ask for at least one mode"));
            }
            let links = cable_links_arg(cable_links)?;
            let (model, case) = load_case(&file, case.as_deref())?;
            print_output(&dynamics::modes_command(&model, case, count, links, json)?, json);
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
            cable_links,
            case,
            csv,
            json,
        } => {
            let links = cable_links_arg(cable_links)?;
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
                links,
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

/// `--cable-links N`: 1 to the most links a cable may be cut into; absent, chosen.
fn cable_links_arg(n: Option<usize>) -> Result<rigwright_core::dynamics::CableLinks, Failure> {
    use rigwright_core::dynamics::{CableLinks, subdivide::MAX_LINKS};
    match n {
        None => Ok(CableLinks::Auto),
        Some(n @ 1..=MAX_LINKS) => Ok(CableLinks::Each(n)),
        Some(n) => Err(Failure::input(format!("--cable-links {n}: give 1 to {MAX_LINKS} links per cable"))),
    }
}
