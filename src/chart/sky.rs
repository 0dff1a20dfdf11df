//! Sky chart (placeholder while being written).
use plotters::coord::Shift;
use plotters::prelude::*;

use super::{ChartError, Plot, SkyChartData, SKY_SIZE};

impl Plot for SkyChartData {
    const NAME: &'static str = "sky";
    fn size(&self) -> (u32, u32) {
        SKY_SIZE
    }
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        root.fill(&WHITE)?;
        Ok(())
    }
}
