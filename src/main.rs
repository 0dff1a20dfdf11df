//! Thin binary: parse arguments, run, map errors to exit codes.
fn main() {
    std::process::exit(passbudget::cli::main_entry());
}
