//! Plan set-up shared by the plan tests: a mission file loaded into the station models, the
//! rate set of the first station and the first element set.

use passbudget::config::mission::Mission;
use passbudget::orbit::ElementSet;
use passbudget::plan::prepare::{rate_set, station_model, RateSet, StationModel};
use std::path::Path;

/// A loaded mission with everything the planner needs.
pub struct PlanSetup {
    pub mission: Mission,
    pub stations: Vec<StationModel>,
    pub rates: RateSet,
    pub elements: ElementSet,
}

/// Loads the mission file at `path`: every station modelled clear-sky, the rate set built on the
/// first station's link, the first element set of the mission's elements file.
pub fn load_plan_setup(path: &Path) -> PlanSetup {
    let mission = Mission::load(path).unwrap();
    let stations: Vec<StationModel> = mission
        .stations
        .iter()
        .map(|s| station_model(&mission, s, None).unwrap())
        .collect();
    let rates = rate_set(&mission, &stations[0].link).unwrap();
    let elements = passbudget::orbit::load_elements(&mission.elements_path)
        .unwrap()
        .remove(0);
    PlanSetup {
        mission,
        stations,
        rates,
        elements,
    }
}

/// Writes `station` as `station.yaml` and `mission` as `mission.yaml` into `dir`, then loads the
/// mission (which names `station.yaml`).
pub fn write_and_load(dir: &Path, station: &str, mission: &str) -> PlanSetup {
    std::fs::write(dir.join("station.yaml"), station).unwrap();
    let path = dir.join("mission.yaml");
    std::fs::write(&path, mission).unwrap();
    load_plan_setup(&path)
}
