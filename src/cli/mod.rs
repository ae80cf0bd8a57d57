//! Command-line front end: clap definitions (stage 1), checked inputs (stage 2), dispatch and rendering.
//!
//! Invariant: every failure becomes one `error: …` line on stderr and exit code 2; no panics on user input.

mod args;
mod box_scan;
mod couplings;
mod export;
mod render;
mod report;
mod scan;
mod symmetry;

use args::{ConfigArgs, Inputs};
use clap::{Parser, Subcommand};
use sheafwright::geometry::Geometry;
use sheafwright::{analysis, slope};
use std::path::PathBuf;

/// Exact geometry and line-bundle data for heterotic models on Calabi-Yau complete intersections.
#[derive(Parser, Debug)]
#[command(name = "sheafwright", version, about, long_about = None)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Everything sheafwright knows about one model file, for a person.
    Report {
        /// The model file (TOML).
        model: PathBuf,
        /// Print one JSON object instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Line-bundle cohomology h^q(X, O_X(k)) for one bundle (--bundle) or every bundle in a box (--box).
    Cohomology {
        #[command(flatten)]
        config: ConfigArgs,
        #[command(flatten)]
        poly: args::PolyArgs,
        /// One line bundle, comma separated, e.g. -1,2,0,1.
        #[arg(long, allow_hyphen_values = true, conflicts_with = "box_range")]
        bundle: Option<String>,
        /// Every bundle with all entries in LO..HI, e.g. -3..3 (JSON Lines with --json).
        #[arg(long = "box", value_name = "LO..HI", allow_hyphen_values = true)]
        box_range: Option<String>,
        /// Include a basis of each cohomology group with its type and lifted Čech–Koszul representative.
        #[arg(long)]
        representatives: bool,
        /// Print the computation time (excluding start-up and output) on stderr.
        #[arg(long)]
        timing: bool,
        /// Worker threads for --box (default: all cores); results never depend on it.
        #[arg(long)]
        threads: Option<usize>,
        /// Print JSON (one object, or one object per line for --box).
        #[arg(long)]
        json: bool,
        /// Run a --box even when its estimated time exceeds the limit (15 min).
        #[arg(long)]
        force: bool,
    },
    /// Consistency checks, slope-zero certificate and the 4d spectrum with charges of a line-bundle sum.
    Spectrum {
        #[command(flatten)]
        config: ConfigArgs,
        #[command(flatten)]
        poly: args::PolyArgs,
        /// Line bundles of the sum, entries comma separated, bundles separated by ';' (default: the model's).
        #[arg(long, allow_hyphen_values = true)]
        bundles: Option<String>,
        /// Draw the Kähler cone, each slope's zero locus and the certificate to this SVG file.
        #[arg(long, value_name = "FILE.svg")]
        plot: Option<PathBuf>,
        /// Print one JSON object instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Screen an enumerated box of line-bundle sums (scan file) or a catalog: survivors and the filter funnel.
    Scan(scan::ScanArgs),
    /// Combine the outputs of the shards of one scan into the unsharded output.
    Merge {
        /// Shard output files (JSON Lines from scan -o).
        files: Vec<PathBuf>,
        /// Write the merged output atomically to this file instead of stdout.
        #[arg(short = 'o', long, value_name = "FILE")]
        output: Option<PathBuf>,
    },
    /// Write everything exact a numerical solver needs (representatives as Dolbeault-form data) to one file.
    Export {
        /// The model file (TOML) with a [bundle] section.
        model: PathBuf,
        /// The output file (written atomically).
        #[arg(short = 'o', long = "output", value_name = "FILE")]
        output: PathBuf,
        /// "json" (default) or "npz" (NumPy arrays of the numeric parts).
        #[arg(long, default_value = "json")]
        format: String,
        #[command(flatten)]
        poly: args::PolyArgs,
        /// Also export, per multiplet, a basis of the Serre-dual space H^2(X, L^*).
        #[arg(long)]
        with_duals: bool,
        /// Print a one-line JSON summary instead of text.
        #[arg(long)]
        json: bool,
    },
    /// Coupling textures: operators from the branching, charge and type selection rules, exact Yukawa values.
    Couplings {
        #[command(flatten)]
        config: ConfigArgs,
        #[command(flatten)]
        poly: args::PolyArgs,
        /// Line bundles of the sum, entries comma separated, bundles separated by ';' (default: the model's).
        #[arg(long, allow_hyphen_values = true)]
        bundles: Option<String>,
        /// For forbidden entries, list the products of up to N present singlets that would allow them.
        #[arg(long, default_value_t = 0, value_name = "N")]
        singlets: usize,
        /// Refuse (with its size, as a warning) any Yukawa tensor whose lifted cocycles or cup products need
        /// more than N Čech–Koszul terms; its entries are then not_computed.
        #[arg(long, default_value_t = sheafwright::couplings::MAX_COCHAIN_TERMS, value_name = "N")]
        max_terms: usize,
        /// Print per-operator timings on stderr.
        #[arg(long)]
        timing: bool,
        /// Print one JSON object instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Intersection numbers, c2(TX), Euler number and index data of the Calabi-Yau.
    Geometry {
        #[command(flatten)]
        config: ConfigArgs,
        /// Print one JSON object instead of tables.
        #[arg(long)]
        json: bool,
    },
}

/// An error for the user: the message is printed after `error: `.
#[derive(Debug)]
pub struct UserError(pub String);

impl<E: std::fmt::Display> From<E> for UserError {
    fn from(e: E) -> Self {
        UserError(e.to_string())
    }
}

/// Run the CLI and return the process exit code.
pub fn run() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return code;
        }
    };
    match dispatch(cli) {
        Ok(text) => {
            use std::io::Write;
            let mut out = std::io::stdout().lock();
            if out.write_all(text.as_bytes()).is_err() {
                return 2;
            }
            0
        }
        Err(UserError(msg)) => {
            eprintln!("error: {msg}");
            2
        }
    }
}

fn dispatch(cli: Cli) -> Result<String, UserError> {
    match cli.command {
        Command::Scan(a) => scan::run(a),
        Command::Merge { files, output } => scan::merge(&files, output.as_deref()),
        Command::Geometry { config, json } => {
            let inputs = Inputs::from_args(&config)?;
            let geometry = Geometry::new(inputs.config());
            let summary = geometry.summary()?;
            if json {
                Ok(render::json_line(&summary)?)
            } else {
                Ok(render::geometry_table(&summary))
            }
        }
        Command::Export {
            model,
            output,
            format,
            poly,
            with_duals,
            json,
        } => export::run(&model, &output, &format, &poly, with_duals, json),
        Command::Cohomology {
            config,
            poly,
            bundle,
            box_range,
            representatives,
            timing,
            threads,
            json,
            force,
        } => {
            if force && box_range.is_none() {
                return Err(UserError("--force applies only to --box".into()));
            }
            let inputs = Inputs::from_args(&config)?;
            let engine = poly.engine(&inputs)?;
            match (bundle, box_range) {
                (Some(b), None) => {
                    let k = args::parse_bundle(&b, inputs.config().num_factors(), "--bundle")?;
                    let started = std::time::Instant::now();
                    let result = engine.cohomology(&k)?;
                    if timing {
                        eprintln!(
                            "timing: cohomology computed in {:.1} µs",
                            started.elapsed().as_secs_f64() * 1e6
                        );
                    }
                    let reps = if representatives {
                        Some(engine.representatives(&k)?)
                    } else {
                        None
                    };
                    if json {
                        let mut v = serde_json::to_value(&*result)?;
                        v["configuration"] = inputs.config().label().into();
                        if let Some(r) = reps {
                            v["representatives"] = serde_json::to_value(r)?;
                        }
                        Ok(render::json_line(&v)?)
                    } else {
                        Ok(render::cohomology_single(&result, reps.as_deref()))
                    }
                }
                (None, Some(range)) => {
                    let (lo, hi) = args::parse_box(&range)?;
                    box_scan::run(&engine, inputs.config(), lo, hi, threads, json, force)
                }
                _ => Err(UserError("give --bundle K or --box LO..HI".into())),
            }
        }
        Command::Spectrum {
            config,
            poly,
            bundles,
            plot,
            json,
        } => {
            let inputs = Inputs::from_args(&config)?;
            let engine = poly.engine(&inputs)?;
            let sum = args::bundle_sum(&inputs, bundles.as_deref())?;
            let analysis = analysis::analyse(&engine, &sum)?;
            if let Some(path) = plot {
                let triple = analysis.geometry.triple.clone().unwrap_or_default();
                let svg = slope::plot_kahler_cone_svg(&triple, sum.bundles(), &analysis.slope_zero);
                sheafwright::io::write_atomic(&path, svg.as_bytes())
                    .map_err(|e| UserError(format!("cannot write {}: {e}", path.display())))?;
            }
            let quotient = symmetry::quotient_section(&inputs, sum.bundles(), &analysis.spectrum)?;
            if json {
                let mut v = render::spectrum_json(&inputs, &analysis)?;
                if let Some((q, _)) = &quotient {
                    for key in ["group_order", "free", "free_certificate", "downstairs"] {
                        v[key] = q[key].clone();
                    }
                }
                Ok(render::json_line(&v)?)
            } else {
                let mut text = report::spectrum_text(&analysis);
                if let Some((_, t)) = &quotient {
                    text.push_str(t);
                }
                Ok(text)
            }
        }
        Command::Couplings {
            config,
            poly,
            bundles,
            singlets,
            max_terms,
            timing,
            json,
        } => couplings::run(couplings::CouplingsArgs {
            config,
            poly,
            bundles,
            singlets,
            max_terms,
            timing,
            json,
        }),
        Command::Report { model, json } => report::run(&model, json),
    }
}
