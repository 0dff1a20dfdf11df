//! The `passbudget` command line: parses arguments, calls the library, prints. Private to the
//! binary: the library exports no command-line types.
#![forbid(unsafe_code)]

mod cli;

fn main() {
    std::process::exit(cli::main_entry());
}
