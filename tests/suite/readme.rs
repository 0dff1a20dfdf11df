//! The README states the project's own tables truthfully: every accepted range of
//! `config::limits` appears in its "Limits" table with the same numbers (a project-consistency
//! check, no outside source).

use crate::common::bin::root;
use passbudget::config::limits::ALL;

fn row(r: &passbudget::config::limits::Range) -> String {
    format!("| `{}` | {} | {} | {} |", r.key, r.min, r.max, r.unit)
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
