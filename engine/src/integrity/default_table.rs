//! The threshold table for the default probabilities (false alarm 0.002/30 per epoch,
//! integrity risk 1e-3), built in so a target needs neither the χ² nor the non-central
//! search: the residual-test threshold and `√λ` for 1 to 60 degrees of freedom. Values from
//! scipy (tools/refvectors/gen_thresholds.py → thresholds_default.csv, pinned scipy), rounded
//! to single precision; table_tests.rs checks them against that file and against the
//! engine's own χ² and non-central χ² searches.

/// Largest degree of freedom in the table.
pub(crate) const DEFAULT_MAX_DOF: usize = 60;

/// The default false-alarm probability the table is for.
pub(crate) const DEFAULT_FALSE_ALARM: f64 = 0.002 / 30.0;

/// The default integrity risk the table is for.
pub(crate) const DEFAULT_INTEGRITY_RISK: f64 = 1e-3;

/// The two-sided normal quantile of the default integrity risk (scipy `norm.isf(5e-4)`).
pub(crate) const DEFAULT_K_MD: f32 = 3.2905266;

/// `(threshold, √λ)` per degree of freedom − 1.
pub(crate) const DEFAULT_TABLE: [(f32, f32); DEFAULT_MAX_DOF] = [
    (15.903178, 7.078111),
    (19.231611, 7.388286),
    (21.954563, 7.609083),
    (24.391392, 7.788),
    (26.652054, 7.9413257),
    (28.789894, 8.076947),
    (30.835636, 8.199395),
    (32.80891, 8.311555),
    (34.72319, 8.4154005),
    (36.588196, 8.512352),
    (38.41122, 8.60347),
    (40.197918, 8.689573),
    (41.95276, 8.771307),
    (43.679363, 8.849192),
    (45.38071, 8.923655),
    (47.059288, 8.995049),
    (48.717194, 9.063677),
    (50.356228, 9.129788),
    (51.977932, 9.1936035),
    (53.58366, 9.255313),
    (55.17459, 9.31508),
    (56.751762, 9.37305),
    (58.3161, 9.429353),
    (59.868427, 9.484101),
    (61.40949, 9.537398),
    (62.93994, 9.589336),
    (64.460396, 9.639997),
    (65.9714, 9.689455),
    (67.47345, 9.73778),
    (68.967, 9.785031),
    (70.45248, 9.831268),
    (71.93026, 9.876543),
    (73.4007, 9.920901),
    (74.86414, 9.96439),
    (76.320885, 10.007048),
    (77.7712, 10.048913),
    (79.21537, 10.090021),
    (80.65363, 10.130405),
    (82.08621, 10.170096),
    (83.51333, 10.209122),
    (84.93519, 10.247508),
    (86.35198, 10.285281),
    (87.763885, 10.322465),
    (89.17107, 10.359079),
    (90.573685, 10.395147),
    (91.971886, 10.430687),
    (93.36583, 10.465718),
    (94.75563, 10.500257),
    (96.141426, 10.534321),
    (97.52333, 10.5679245),
    (98.901474, 10.601084),
    (100.27595, 10.633813),
    (101.64687, 10.666124),
    (103.014336, 10.69803),
    (104.37844, 10.729546),
    (105.73928, 10.760679),
    (107.096924, 10.791443),
    (108.45148, 10.821847),
    (109.80301, 10.851902),
    (111.15159, 10.881618),
];
