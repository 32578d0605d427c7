//! `rigwright`: the command line (headless subcommands).

fn main() -> std::process::ExitCode {
    rigwright::cli::main()
}
