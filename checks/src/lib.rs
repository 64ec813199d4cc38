//! fourforce's checks: the integration test suite (`tests/suite/`, one module per library
//! module), the benchmarks (`benches/`) and the reference data (`tests/reference/`). This library
//! is empty; run `cargo test -p fourforce-checks --all-features` or `cargo bench -p fourforce-checks`.
