//! All integration tests in one binary (one link step instead of one per file). Each module is
//! a former top-level test file; shared helpers live in `common`.

mod common;

mod antenna_noise;
mod atmosphere_alloc;
mod atmosphere_api;
mod atmosphere_valex;
mod body_track;
mod chart_render;
mod cli_budget;
mod cli_options;
mod cli_passes;
mod contact_plan;
mod fuzz_replay;
mod geometry_skyfield;
mod golden_outputs;
mod hardening;
mod interpolation_bounds;
mod link_budget;
mod link_path_antenna;
mod modcod_thresholds;
mod moon_position;
mod mount_pfd;
mod noise_disk;
mod noise_sky_system;
mod operator_outputs;
mod orbit_input;
mod orbit_sgp4_verification;
mod output_folder;
mod passes_min_range;
mod passes_search;
mod pipeline;
mod plan_checks;
mod plan_properties;
mod plan_worked_pass;
mod readme;
mod schedule_exhaustive;
mod sun_noise;
mod sun_position;
mod terrain_noise;
mod user_schemes;
