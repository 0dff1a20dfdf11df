//! Plan the shipped example week with the library alone (no command line) and print its totals as
//! JSON, the same object as `passbudget plan examples/wrenlet-1.yaml --format json` gives under
//! `totals`.
//!
//! ```text
//! cargo run --release --example plan_week
//! ```

use passbudget::config::mission::Mission;
use passbudget::plan::{PlanRequest, Planner};
use passbudget::report::plan::TotalsRow;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/wrenlet-1.yaml");
    let mission = Mission::load(&path)?;
    let planner = Planner::new(&mission, &PlanRequest::default())?;
    let plan = planner.collect()?;
    let totals = TotalsRow::new(&plan.totals, planner.rates());
    println!("{}", serde_json::to_string_pretty(&totals)?);
    Ok(())
}
