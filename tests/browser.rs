//! The demo's glycolysis map in a real browser (headless Chromium): the
//! screenshot is not blank and shows the map's colours, the page logs no
//! console errors, and the zoom script ran. Skipped loudly when Chromium is
//! not installed; under `CI=true` a missing Chromium fails the test
//! (`.ci/run` installs it from the distribution's packages).

mod common;

use common::browser::{chromium_or_skip, console_errors};
use std::path::Path;
use std::time::Duration;

fn chromium(binary: &Path, profile: &Path, extra: &[String], url: &str) -> std::process::Output {
    common::browser::run(binary, profile, extra, url, Duration::from_secs(90))
}

#[test]
fn group_map_renders_in_headless_chromium() {
    let Some(binary) = chromium_or_skip("group_map_renders_in_headless_chromium") else {
        return;
    };
    let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let report = gibbsite::Project::load(&demo)
        .expect("demo loads")
        .analyse();
    let tmp = tempfile::tempdir().unwrap();
    let site = tmp.path().join("site");
    gibbsite::site::render(&report, None, &site).unwrap();
    let page = site.join("maps/glycolysis.html");
    assert!(page.is_file());
    let url = format!("file://{}", page.display());

    // Screenshot.
    let shot = tmp.path().join("map.png");
    let run = chromium(
        &binary,
        &tmp.path().join("profile-1"),
        &[format!("--screenshot={}", shot.display())],
        &url,
    );
    let stderr = String::from_utf8_lossy(&run.stderr);
    assert!(shot.is_file(), "no screenshot written:\n{stderr}");
    assert_eq!(console_errors(&stderr), Vec::<&str>::new(), "{stderr}");

    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(&shot).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buf).unwrap();
    let channels = info.color_type.samples();
    let pixels: Vec<&[u8]> = buf[..info.buffer_size()].chunks(channels).collect();
    assert_eq!(pixels.len(), 1200 * 1000, "{:?}", (info.width, info.height));
    let not_white = pixels.iter().filter(|p| p[..3] != [255, 255, 255]).count();
    // Close to the "consistent" blue of the arrows (#1f5fa8), allowing for
    // antialiasing.
    let near = |p: &[u8], c: [u8; 3]| {
        p.iter()
            .zip(c)
            .all(|(&a, b)| (a as i32 - b as i32).abs() <= 12)
    };
    let blue = pixels
        .iter()
        .filter(|p| near(p, [0x1f, 0x5f, 0xa8]))
        .count();
    assert!(
        not_white > pixels.len() / 20,
        "screenshot nearly blank: {not_white} coloured pixels"
    );
    assert!(blue > 300, "no map arrows visible: {blue} blue pixels");

    // The DOM after scripts ran: the zoom script marked the map.
    let dom = chromium(
        &binary,
        &tmp.path().join("profile-2"),
        &["--dump-dom".to_string()],
        &url,
    );
    let html = String::from_utf8_lossy(&dom.stdout);
    let stderr = String::from_utf8_lossy(&dom.stderr);
    assert!(html.contains("net-map"), "no map in the DOM:\n{stderr}");
    assert!(
        html.contains("data-zoom=\"ready\""),
        "the zoom script did not run:\n{stderr}"
    );
    assert_eq!(console_errors(&stderr), Vec::<&str>::new(), "{stderr}");
}
