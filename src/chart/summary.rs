//! Sky chart (placeholder while being written).
use plotters::coord::Shift;
use plotters::prelude::*;

use super::{ChartError, Plot, SummaryChartData, SUMMARY_SIZE};

impl Plot for SummaryChartData {
    const NAME: &'static str = "summary";
    fn size(&self) -> (u32, u32) {
        SUMMARY_SIZE
    }
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        root.fill(&WHITE)?;
        Ok(())
    }
}
