//! The `sheafwright` command line: parse arguments, load and check inputs, call the library, render.
//!
//! Exit codes: 0 success (a model that fails a physics check is still a success: the report says so);
//! 2 bad input or any other error (one line on stderr starting with `error:`). Nothing is computed here.

#![allow(clippy::needless_range_loop)]

mod cli;

fn main() {
    std::process::exit(cli::run());
}
