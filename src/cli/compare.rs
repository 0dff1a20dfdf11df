//! `passbudget compare`: two plans of one window side by side (two missions, or one mission and
//! `--set-b` overrides for the second run).

use crate::cli::common::{note, warn, Format};
use crate::cli::table::{Align, Table};
use crate::cli::window::WindowArgs;
use anyhow::Result;
use passbudget::config::mission::Mission;
use passbudget::config::overrides::Overrides;
use passbudget::engfmt;
use passbudget::report::compare::{compare as compare_plans, Comparison, PassDiffRow, Side};
use passbudget::report::to_csv;
use serde::Serialize;
use std::io::Write;
use std::path::PathBuf;

#[derive(Debug, Clone, clap::Args)]
pub struct CompareArgs {
    /// Run A: the mission, the window flags and `--set` (which applies to both runs).
    #[command(flatten)]
    pub window: WindowArgs,
    /// Mission file of run B (default: the same as A).
    #[arg(value_name = "MISSION_B")]
    pub mission_b: Option<PathBuf>,
    /// Override a key for run B only, after the `--set` overrides (same form as --set); repeatable.
    #[arg(long = "set-b", value_name = "KEY=VALUE")]
    pub set_b: Vec<String>,
    /// Output on stdout: a table for people, or CSV (one row per pass) or JSON (passes and totals).
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

/// One run as the JSON names it: the mission file and the overrides.
#[derive(Serialize)]
struct RunDoc {
    mission: String,
    set: Vec<String>,
}

/// `passbudget compare`.
pub fn compare(a: CompareArgs, out: &mut dyn Write) -> Result<()> {
    let path_a = a.window.mission.path().to_path_buf();
    let path_b = a.mission_b.clone().unwrap_or_else(|| path_a.clone());
    let shared = a.window.mission.overrides()?;
    let only_b = Overrides::parse_as(&a.set_b, "--set-b")?;
    // Mission A's file is read once: B is the same file unless a second one is given, and a
    // file given as a pipe can be read only once.
    let text_a = passbudget::config::read_yaml_text(&path_a)?;
    let mission_a = Mission::from_yaml_with(&path_a, &text_a, &shared)?;
    let planner_a = a
        .window
        .planner_of(false, mission_a, &path_a, &shared, None)?;
    let window = planner_a.window();
    let shared_b = shared.and(&only_b);
    let mission_b = match &a.mission_b {
        Some(_) => Mission::load_with(&path_b, &shared_b)?,
        None => Mission::from_yaml_with(&path_a, &text_a, &shared_b)?,
    };
    let planner_b = a
        .window
        .planner_of(false, mission_b, &path_b, &shared_b, Some(&window))?;
    let plan_a = planner_a.collect()?;
    let plan_b = planner_b.collect()?;
    warn(&run_warnings(&plan_a.warnings, &plan_b.warnings));
    note(&run_warnings(
        &plan_a.note_lines(|_| true),
        &plan_b.note_lines(|_| true),
    ));
    let side = |planner, plan| Side { planner, plan };
    let cmp = compare_plans(side(&planner_a, &plan_a), side(&planner_b, &plan_b));
    let run_b_set: Vec<String> = a
        .window
        .mission
        .set
        .iter()
        .chain(&a.set_b)
        .cloned()
        .collect();
    let runs = [
        RunDoc {
            mission: path_a.display().to_string(),
            set: a.window.mission.set.clone(),
        },
        RunDoc {
            mission: path_b.display().to_string(),
            set: run_b_set,
        },
    ];
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                a: &'a RunDoc,
                b: &'a RunDoc,
                #[serde(flatten)]
                comparison: &'a Comparison,
                caution: &'static str,
                warnings: Vec<String>,
            }
            let doc = Doc {
                caution: passbudget::report::plan::CAUTION,
                warnings: run_warnings(&flagged(&plan_a), &flagged(&plan_b)),
                a: &runs[0],
                b: &runs[1],
                comparison: &cmp,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => {
            let warnings = run_warnings(&flagged(&plan_a), &flagged(&plan_b));
            write!(out, "{}", to_csv(&cmp.passes, &warnings)?)?
        }
        Format::Table => {
            print_comparison(&runs, &cmp, out)?;
            writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
        }
    }
    Ok(())
}

fn run_text(r: &RunDoc) -> String {
    let mut t = r.mission.clone();
    for s in &r.set {
        t.push_str(&format!(" --set {s}"));
    }
    t
}

/// A difference with its sign, `-` for none, and no sign for one that shows as zero (`0.0`,
/// not `-0.0` or `+0.00` for a few milliseconds or thousandths of a dB).
fn signed(x: Option<f64>, text: impl Fn(f64) -> String) -> String {
    let Some(v) = x else {
        return "-".into();
    };
    let shown = text(v.abs());
    let zero = !shown.chars().any(|c| c.is_ascii_digit() && c != '0');
    match (zero, v > 0.0) {
        (true, _) => text(0.0),
        (false, true) => format!("+{shown}"),
        (false, false) => format!("-{shown}"),
    }
}

fn opt(x: Option<f64>, text: impl Fn(f64) -> String) -> String {
    x.map(text).unwrap_or_else(|| "-".into())
}

fn print_comparison(runs: &[RunDoc; 2], c: &Comparison, out: &mut dyn Write) -> Result<()> {
    writeln!(out, "A: {}", run_text(&runs[0]))?;
    writeln!(out, "B: {}", run_text(&runs[1]))?;
    writeln!(
        out,
        "window {} to {}; differences are B - A",
        c.window_start, c.window_end
    )?;
    let mut t = Table::new(&[
        ("pass id", Align::Left),
        ("in", Align::Left),
        ("rate A", Align::Right),
        ("rate B", Align::Right),
        ("fixed A", Align::Right),
        ("fixed B", Align::Right),
        ("diff fixed", Align::Right),
        ("diff closes from s", Align::Right),
        ("diff until s", Align::Right),
        ("peak margin A dB", Align::Right),
        ("B dB", Align::Right),
        ("diff dB", Align::Right),
        ("diff C/N0 dB", Align::Right),
    ]);
    for p in &c.passes {
        t.row(pass_cells(p));
    }
    write!(out, "{}", t.render())?;
    writeln!(
        out,
        "peak margin: at the pass's best step, of its chosen rate in that run (a rate change can \
         hide a gain); diff C/N0: the change of the pass's highest C/N0, whatever the rates (clear sky)"
    )?;
    let s = &c.totals;
    writeln!(
        out,
        "\npasses: A {}, B {} ({} in both, {} with another rate); closing: A {}, B {}",
        s.a_passes,
        s.b_passes,
        s.passes_matched,
        s.passes_rate_changed,
        s.a_passes_closing,
        s.b_passes_closing
    )?;
    for (what, x, y, d) in [
        (
            "fixed rate per pass",
            s.a_volume_bits,
            s.b_volume_bits,
            s.diff_volume_bits,
        ),
        (
            "adaptive",
            s.a_adaptive_volume_bits,
            s.b_adaptive_volume_bits,
            s.diff_adaptive_volume_bits,
        ),
        (
            "network",
            s.a_network_volume_bits,
            s.b_network_volume_bits,
            s.diff_network_volume_bits,
        ),
    ] {
        writeln!(
            out,
            "  {what:<20} A {:>12}  B {:>12}  diff {:>12}",
            engfmt::volume(x),
            engfmt::volume(y),
            signed(Some(d), engfmt::volume)
        )?;
    }
    Ok(())
}

fn pass_cells(p: &PassDiffRow) -> Vec<String> {
    let in_runs = match p.in_runs.as_str() {
        "both" => "A B",
        "a" => "A",
        _ => "B",
    };
    // The pass's rate in a run that holds it ("none": no rate closes), `-` in a run that does not.
    let rate = |held: bool, r: Option<f64>| match (held, r) {
        (false, _) => "-".to_string(),
        (true, None) => "none".to_string(),
        (true, Some(x)) => engfmt::rate(x),
    };
    let db = |x: f64| format!("{x:.2}");
    let s1 = |x: f64| format!("{x:.1}");
    vec![
        p.pass_id.clone(),
        in_runs.into(),
        rate(p.a_volume_bits.is_some(), p.a_rate_bps),
        rate(p.b_volume_bits.is_some(), p.b_rate_bps),
        opt(p.a_volume_bits, engfmt::volume),
        opt(p.b_volume_bits, engfmt::volume),
        signed(Some(p.diff_volume_bits), engfmt::volume),
        signed(p.diff_closes_from_s, s1),
        signed(p.diff_closes_until_s, s1),
        opt(p.a_peak_margin_db, db),
        opt(p.b_peak_margin_db, db),
        signed(p.diff_peak_margin_db, db),
        signed(p.diff_peak_cn0_db, db),
    ]
}

/// A run's warnings with the thresholds recalled from memory its rates rest on (the pfd row:
/// `compare` shows no pfd) and the element-set notes (the set chosen from a history, OMM fields
/// read past).
fn flagged(plan: &passbudget::plan::Plan) -> Vec<String> {
    use passbudget::plan::NoteKind as K;
    plan.warnings_with(&[K::RecalledThreshold, K::ElementSet])
}

/// Both runs' warnings, each marked with its run: once as `runs A and B:` when both runs raise it
/// (most do, the two runs sharing their stations and window), else `run A:` or `run B:`.
fn run_warnings(a: &[String], b: &[String]) -> Vec<String> {
    // each run's lines once, in their order
    let once = |v: &[String]| -> Vec<String> {
        let mut seen: Vec<String> = Vec::new();
        for w in v {
            if !seen.contains(w) {
                seen.push(w.clone());
            }
        }
        seen
    };
    let (a, b) = (&once(a), &once(b));
    let tagged_a = a.iter().map(|w| {
        if b.contains(w) {
            format!("runs A and B: {w}")
        } else {
            format!("run A: {w}")
        }
    });
    let only_b = b.iter().filter(|w| !a.contains(w));
    tagged_a
        .chain(only_b.map(|w| format!("run B: {w}")))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::signed;

    /// A difference that shows as zero has no sign (a few ms read `-0.0`, a thousandth of a dB
    /// `+0.00`); others keep theirs.
    #[test]
    fn a_difference_shown_as_zero_has_no_sign() {
        let s1 = |x: f64| format!("{x:.1}");
        let db = |x: f64| format!("{x:.2}");
        assert_eq!(signed(Some(-0.04), s1), "0.0");
        assert_eq!(signed(Some(0.001), db), "0.00");
        assert_eq!(signed(Some(28.7), s1), "+28.7");
        assert_eq!(signed(Some(-26.2), s1), "-26.2");
        assert_eq!(signed(None, s1), "-");
    }
}
