//! Feature `defmt`: every public type of the crate implements `defmt::Format`.
//!
//! Two halves. `every_listed_type_is_format` does not compile if a listed type lacks
//! `defmt::Format`. `every_public_type_is_listed` reads the sources and fails when a `pub struct`
//! or `pub enum` is missing from the list, so a new type cannot slip past the first half.
#![cfg(feature = "defmt")]

/// Requires `defmt::Format` at compile time.
const fn format<T: defmt::Format + ?Sized>() {}

/// Lists each public type once (by its name) and requires `defmt::Format` of it, in both
/// precisions where it is generic.
macro_rules! public_types {
    ($($name:ident => [$($ty:ty),+ $(,)?]),+ $(,)?) => {
        const LISTED: &[&str] = &[$(stringify!($name)),+];
        #[test]
        fn every_listed_type_is_format() {
            $($(format::<$ty>();)+)+
            // heapless's own types in our API: its `defmt-03` feature implements defmt 0.3's
            // Format, and defmt 0.3.100+ re-exports defmt 1, so the trait is the same.
            format::<heapless::Vec<u8, 4>>();
        }
    };
}

public_types! {
    Error => [fourforce::Error],
    Species => [fourforce::Species<f32>, fourforce::Species<f64>],
    ThreeVector => [fourforce::ThreeVector<f32>, fourforce::ThreeVector<f64>],
    FourVector => [fourforce::FourVector<f32>, fourforce::FourVector<f64>],
    Covector => [fourforce::Covector<f32>, fourforce::Covector<f64>],
    Metric => [fourforce::Metric],
    FieldTensor => [fourforce::FieldTensor<f32>, fourforce::FieldTensor<f64>],
    CovariantFieldTensor => [
        fourforce::CovariantFieldTensor<f32>,
        fourforce::CovariantFieldTensor<f64>,
    ],
    Boost => [fourforce::Boost<f32>, fourforce::Boost<f64>],
    LorentzTransform => [fourforce::LorentzTransform<f32>, fourforce::LorentzTransform<f64>],
    Motion => [fourforce::Motion<f32>, fourforce::Motion<f64>],
    Particle => [fourforce::push::Particle<f32>, fourforce::push::Particle<f64>],
    StepFactors => [fourforce::push::StepFactors<f32>, fourforce::push::StepFactors<f64>],
    SumOfFields => [
        fourforce::push::SumOfFields<fourforce::FieldTensor<f32>, fourforce::FieldTensor<f32>>,
    ],
    Boris => [fourforce::push::Boris<f32>, fourforce::push::Boris<f64>],
    Vay => [fourforce::push::Vay<f32>, fourforce::push::Vay<f64>],
    HigueraCary => [fourforce::push::HigueraCary<f32>, fourforce::push::HigueraCary<f64>],
    // motion: beam line, checks, steering
    KickDirection => [fourforce::beamline::KickDirection<f32>, fourforce::beamline::KickDirection<f64>],
    Element => [fourforce::beamline::Element<f32>, fourforce::beamline::Element<f64>],
    BeamState => [fourforce::beamline::BeamState<f32>, fourforce::beamline::BeamState<f64>],
    BeamLine => [fourforce::beamline::BeamLine<f32, 16>, fourforce::beamline::BeamLine<f64, 4>],
    States => [fourforce::beamline::States<'static, f32>, fourforce::beamline::States<'static, f64>],
    Verdict => [fourforce::check::Verdict<f32>, fourforce::check::Verdict<f64>],
    EnergyWindow => [fourforce::check::EnergyWindow<f32>, fourforce::check::EnergyWindow<f64>],
    Trend => [fourforce::check::Trend],
    MovingWindow => [fourforce::check::MovingWindow<f32, 8>, fourforce::check::MovingWindow<f64, 32>],
    // orbit
    Response => [fourforce::orbit::Response<f32, 8, 12>, fourforce::orbit::Response<f64, 2, 2>],
    Monitor => [fourforce::orbit::Monitor<f32>, fourforce::orbit::Monitor<f64>],
    Corrector => [fourforce::orbit::Corrector<f32>, fourforce::orbit::Corrector<f64>],
    Tuning => [fourforce::orbit::Tuning<f32>, fourforce::orbit::Tuning<f64>],
    Place => [fourforce::orbit::Place<f32>, fourforce::orbit::Place<f64>],
    Kick => [fourforce::orbit::Kick],
    State => [fourforce::orbit::State],
    Outcome => [fourforce::orbit::Outcome],
    Calibration => [fourforce::orbit::Calibration<f32, 7>, fourforce::orbit::Calibration<f64, 2>],
    // witness
    Reading => [fourforce::witness::Reading<f32>, fourforce::witness::Reading<f64>],
    Estimate => [fourforce::witness::Estimate<f32>, fourforce::witness::Estimate<f64>],
    Alpha => [fourforce::witness::Alpha],
    ReadingError => [fourforce::witness::ReadingError],
    Assessment => [fourforce::witness::Assessment<f32, 4>, fourforce::witness::Assessment<f64, 16>],
    SpeciesVerdict => [fourforce::witness::SpeciesVerdict],
    Watch => [fourforce::witness::Watch<f32, 4>, fourforce::witness::Watch<f64, 16>],
    // linear optics
    TransferMap => [fourforce::transfer::TransferMap<f32>, fourforce::transfer::TransferMap<f64>],
    CellOptics => [fourforce::transfer::CellOptics<f32>, fourforce::transfer::CellOptics<f64>],
    Twiss => [fourforce::transfer::Twiss<f32>, fourforce::transfer::Twiss<f64>],
    Envelope => [fourforce::transfer::Envelope<f32>, fourforce::transfer::Envelope<f64>],
    Envelopes => [fourforce::beamline::Envelopes<'static, f32>, fourforce::beamline::Envelopes<'static, f64>],
    Plane => [fourforce::beamline::Plane],
    Aperture => [fourforce::beamline::Aperture<f32>, fourforce::beamline::Aperture<f64>],
    ApertureVerdict => [fourforce::beamline::ApertureVerdict<f32>, fourforce::beamline::ApertureVerdict<f64>],
    // steering a whole line
    Place => [fourforce::orbit::Place<f32>, fourforce::orbit::Place<f64>],
    Kick => [fourforce::orbit::Kick],
    Response => [fourforce::orbit::Response<f32, 8, 6>, fourforce::orbit::Response<f64, 8, 6>],
    Monitor => [fourforce::orbit::Monitor<f32>, fourforce::orbit::Monitor<f64>],
    Corrector => [fourforce::orbit::Corrector<f32>, fourforce::orbit::Corrector<f64>],
    Tuning => [fourforce::orbit::Tuning<f32>, fourforce::orbit::Tuning<f64>],
    State => [fourforce::orbit::State],
    Outcome => [fourforce::orbit::Outcome],
    Orbit => [fourforce::orbit::Orbit<f32, 8, 6>, fourforce::orbit::Orbit<f64, 8, 6>],
    Calibration => [fourforce::orbit::Calibration<f32, 4>, fourforce::orbit::Calibration<f64, 4>],
}

/// `pub` types that are not reachable from outside the crate (none so far).
const NOT_PUBLIC: &[&str] = &[];

/// Names of the `pub struct` / `pub enum` items in a Rust source (not `pub(crate)` ones).
fn public_type_names(source: &str) -> Vec<String> {
    source
        .lines()
        .map(str::trim_start)
        .filter_map(|l| {
            l.strip_prefix("pub struct ")
                .or_else(|| l.strip_prefix("pub enum "))
        })
        .map(|rest| {
            rest.chars()
                .take_while(|c| c.is_alphanumeric() || *c == '_')
                .collect()
        })
        .collect()
}

fn rust_files(dir: &std::path::Path, out: &mut Vec<std::path::PathBuf>) {
    for entry in std::fs::read_dir(dir).expect("src/ is readable") {
        let path = entry.expect("directory entry").path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.push(path);
        }
    }
}

#[test]
fn every_public_type_is_listed() {
    let mut files = Vec::new();
    rust_files(
        &std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../src"),
        &mut files,
    );
    let mut missing = Vec::new();
    let mut found = 0;
    for file in &files {
        let source = std::fs::read_to_string(file).expect("source is readable");
        for name in public_type_names(&source) {
            found += 1;
            if !LISTED.contains(&name.as_str()) && !NOT_PUBLIC.contains(&name.as_str()) {
                missing.push(format!("{name} ({})", file.display()));
            }
        }
    }
    assert!(
        found >= 3,
        "the source scan found only {found} public types"
    );
    assert!(
        missing.is_empty(),
        "public types not listed in checks/tests/suite/defmt.rs (add them to `public_types!` with \
         a defmt::Format derive): {missing:?}"
    );
}

#[test]
fn the_scan_finds_structs_and_enums_but_not_crate_private_ones() {
    let src = "pub struct A<T> {}\n  pub enum B {}\npub(crate) struct C;\nstruct D;\npub struct E;";
    assert_eq!(public_type_names(src), ["A", "B", "E"]);
}
