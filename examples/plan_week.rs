//! Plan the shipped example week with the library alone (no command line), book its contacts and
//! print the totals as JSON, the same object as `passbudget plan examples/wrenlet-1.yaml --format
//! json` gives under `totals` (the delivered data of the contact plan first).
//!
//! ```text
//! cargo run --release --example plan_week
//! ```

use passbudget::config::mission::Mission;
use passbudget::plan::fleet::contact_plan;
use passbudget::plan::{PlanRequest, Planner};
use passbudget::report::plan::PlanDoc;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/wrenlet-1.yaml");
    let mission = Mission::load(&path)?;
    let planner = Planner::new(&mission, &PlanRequest::default())?;
    let plan = planner.collect()?;
    let contacts = contact_plan(&[&planner], std::slice::from_ref(&plan))?;
    let doc = PlanDoc::with_contacts(&planner, &plan, &contacts);
    println!("{}", serde_json::to_string_pretty(&doc.totals)?);
    Ok(())
}
