//! The README states the project's own tables truthfully: every accepted range of
//! `config::limits` appears in its "Limits" table with the same numbers (a project-consistency
//! check, no outside source).

use crate::common::bin::root;
use passbudget::config::limits::{applies_to, ALL};

/// A row of the table; where a key has several ranges, what each applies to follows the key in
/// parentheses.
fn row(r: &passbudget::config::limits::Range) -> String {
    let what = applies_to(r);
    let key = if what.is_empty() {
        format!("`{}`", r.key)
    } else {
        format!("`{}` ({what})", r.key)
    };
    format!("| {key} | {} | {} | {} |", r.min, r.max, r.unit)
}

/// Every row of the table is unambiguous: a key given for several ranges says for each what it
/// applies to (before: `transmitter.antenna.gain_dbi`, `transmitter.antenna.table` and
/// `horizon_mask` each stood twice with nothing to tell the rows apart).
#[test]
fn readme_limits_rows_are_unambiguous() {
    let rows: Vec<String> = ALL
        .iter()
        .map(|r| row(r).split(" | ").next().unwrap().to_string())
        .collect();
    for (i, a) in rows.iter().enumerate() {
        assert!(!rows[..i].contains(a), "the Limits table has two rows {a}");
    }
    for r in ALL {
        let twice = ALL.iter().filter(|o| o.key == r.key).count() > 1;
        assert_eq!(twice, !applies_to(r).is_empty(), "{}", r.key);
    }
}

#[test]
fn readme_limits_table_mirrors_the_library() {
    let readme = std::fs::read_to_string(root().join("README.md")).unwrap();
    let missing: Vec<String> = ALL
        .iter()
        .map(row)
        .filter(|r| !readme.lines().any(|l| l.trim() == r))
        .collect();
    let table: Vec<String> = ALL.iter().map(row).collect();
    assert!(
        missing.is_empty(),
        "README Limits rows missing or different: {missing:#?}\nthe table:\n| key | min | max | unit |\n|---|---|---|---|\n{}",
        table.join("\n")
    );
}
