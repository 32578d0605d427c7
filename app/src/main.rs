//! `rigwright`: opens the window, or runs a headless subcommand.

fn main() -> std::process::ExitCode {
    rigwright::cli::main()
}
