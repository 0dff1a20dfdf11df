//! Plan set-up shared by the plan tests: a mission file prepared by the library's planner, with its
//! station models, rate set and element set at hand.

use passbudget::config::mission::Mission;
use passbudget::orbit::ElementSet;
use passbudget::plan::prepare::{RateSet, StationModel};
use passbudget::plan::{Plan, PlanRequest, Planner, WindowRequest};
use std::path::Path;

/// A loaded mission with everything the planner prepared.
pub struct PlanSetup {
    pub mission: Mission,
    pub stations: Vec<StationModel>,
    pub rates: RateSet,
    pub elements: ElementSet,
}

impl PlanSetup {
    /// Plan the window from `start` to `end` (the mission's other settings unchanged).
    pub fn plan_between(
        &self,
        start: chrono::DateTime<chrono::Utc>,
        end: chrono::DateTime<chrono::Utc>,
    ) -> Plan {
        self.planner(start, end).collect().unwrap()
    }

    /// The planner of the window from `start` to `end`.
    pub fn planner(
        &self,
        start: chrono::DateTime<chrono::Utc>,
        end: chrono::DateTime<chrono::Utc>,
    ) -> Planner {
        let request = PlanRequest {
            window: WindowRequest {
                start: Some(start),
                end: Some(end),
                days: None,
            },
            ..Default::default()
        };
        Planner::new(&self.mission, &request).unwrap()
    }
}

/// Loads the mission file at `path` through the planner (its own window).
pub fn load_plan_setup(path: &Path) -> PlanSetup {
    let mission = Mission::load(path).unwrap();
    let start = mission
        .start
        .unwrap_or_else(|| passbudget::timefmt::utc(2026, 12, 1, 12, 0, 0));
    let request = PlanRequest {
        window: WindowRequest {
            start: Some(start),
            ..Default::default()
        },
        ..Default::default()
    };
    let planner = Planner::new(&mission, &request).unwrap();
    PlanSetup {
        stations: planner.stations().to_vec(),
        rates: planner.rates().clone(),
        elements: planner.elements().clone(),
        mission,
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
