//! The printable tech sheet (`check --format html`): self-contained for every demo engine,
//! snapshotted for one, with the seals of a built declaration on page one, rendered by
//! headless Chromium into a page that is not blank, and printed by it to PDF on at most two
//! Letter and two A4 pages (counted by `pdfinfo`, Debian's `poppler-utils`).
//! Chromium is Debian's `chromium` package. The browser test is `#[ignore]`d, so a plain
//! `cargo test` reports it as ignored, never as passed; `.ci/run` installs Chromium and runs it
//! with `--ignored`, where it fails when Chromium is missing.

use std::path::{Path, PathBuf};
use std::process::Command;

use gonogo::commands::check::{self, CheckFormat, CheckRequest};

mod common;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

fn sheet(declaration: &Path) -> String {
    let declarations = [declaration
        .strip_prefix(env!("CARGO_MANIFEST_DIR"))
        .unwrap_or(declaration)
        .to_path_buf()];
    let request = CheckRequest {
        notes: None,
        rules: Path::new(RULES),
        class: None,
        role: None,
        format: CheckFormat::Html,
        declarations: &declarations,
        jobs: None,
        monte_carlo: None,
        produced: "2027-05-11T01:46:40Z".to_string(),
        sort: gonogo::commands::check::CheckSort::File,
        sections: None,
    };
    check::run(&request)
        .map(|(html, _)| html)
        .unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn every_tech_sheet_stands_alone() {
    for path in common::files_under("engines-demo", ".yaml") {
        let html = sheet(&path);
        assert!(html.starts_with("<!doctype html>"), "{}", path.display());
        assert!(
            !html.contains("http"),
            "{}: refers to the network",
            path.display()
        );
        assert!(
            !html.contains("src="),
            "{}: loads an outside file",
            path.display()
        );
        assert!(
            html.contains("Inspector — name, signature, time"),
            "{}: no signature lines",
            path.display()
        );
    }
}

#[test]
fn the_close_bore_tech_sheet() {
    let html = sheet(Path::new("engines-demo/limited2-close-bore.yaml"));
    assert!(
        html.matches("<svg class=\"scale\"").count() >= 10,
        "a scale for every numeric limit"
    );
    insta::assert_snapshot!(html);
}

#[test]
fn the_close_bore_markdown_report() {
    let declarations = [PathBuf::from("engines-demo/limited2-close-bore.yaml")];
    let request = CheckRequest {
        notes: None,
        rules: Path::new(RULES),
        class: None,
        role: None,
        format: CheckFormat::Markdown,
        declarations: &declarations,
        jobs: None,
        monte_carlo: None,
        produced: "2027-05-11T01:46:40Z".to_string(),
        sort: gonogo::commands::check::CheckSort::File,
        sections: None,
    };
    let (markdown, _) = check::run(&request).unwrap_or_else(|e| panic!("{e}"));
    assert!(
        markdown.contains("## (✓) 3.2 Bore, every cylinder — LEGAL · conditional pass"),
        "{markdown}"
    );
    insta::assert_snapshot!(markdown);
}

fn chromium() -> Option<PathBuf> {
    ["/usr/bin/chromium", "/usr/bin/chromium-browser"]
        .iter()
        .map(PathBuf::from)
        .find(|p| p.exists())
}

#[test]
#[ignore = "needs Chromium: run with `cargo test --test html -- --ignored` (.ci/run does)"]
fn the_tech_sheet_renders_in_headless_chromium() {
    let Some(browser) = chromium() else {
        panic!(
            "Chromium is not installed (Debian package `chromium`): the browser test cannot run"
        );
    };
    let dir = std::env::temp_dir().join(format!("gonogo-{}-browser", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let page = dir.join("sheet.html");
    std::fs::write(
        &page,
        sheet(Path::new("engines-demo/limited2-close-bore.yaml")),
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let png = dir.join("sheet.png");
    let status = Command::new(browser)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
        ])
        .arg(format!("--user-data-dir={}", dir.join("profile").display()))
        .args(["--window-size=1000,1400"])
        .arg(format!("--screenshot={}", png.display()))
        .arg(format!("file://{}", page.display()))
        .output()
        .unwrap_or_else(|e| panic!("cannot start Chromium: {e}"));
    assert!(
        png.exists(),
        "Chromium wrote no screenshot: {}",
        String::from_utf8_lossy(&status.stderr)
    );
    let decoder = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(&png).unwrap_or_else(|e| panic!("{e}")),
    ));
    let mut reader = decoder.read_info().unwrap_or_else(|e| panic!("{e}"));
    let mut pixels = vec![0; reader.output_buffer_size().unwrap_or(0)];
    let info = reader
        .next_frame(&mut pixels)
        .unwrap_or_else(|e| panic!("{e}"));
    let _ = std::fs::remove_dir_all(&dir);
    let bytes = &pixels[..info.buffer_size()];
    let dark = bytes
        .chunks(info.color_type.samples())
        .filter(|p| p.iter().take(3).any(|c| *c < 128))
        .count();
    let total = bytes.len() / info.color_type.samples();
    // text, rules and scales darken a few percent of a page; a blank page darkens none
    assert!(
        dark * 200 > total,
        "the rendered page is blank: {dark} dark pixels of {total}"
    );
    // the blue of the value markers is there: the SVG scales were drawn
    let blue = bytes
        .chunks(info.color_type.samples())
        .filter(|p| p.len() >= 3 && p[2] > 120 && p[0] < 80 && p[1] < 120)
        .count();
    assert!(blue > 50, "no value marker drawn ({blue} blue pixels)");
}

/// The pages `pdfinfo` (poppler-utils) counts in a PDF.
fn pages(pdf: &Path) -> usize {
    let out = Command::new("pdfinfo")
        .arg(pdf)
        .output()
        .unwrap_or_else(|e| panic!("pdfinfo (Debian package `poppler-utils`) cannot run: {e}"));
    String::from_utf8_lossy(&out.stdout)
        .lines()
        .find_map(|l| l.strip_prefix("Pages:"))
        .and_then(|n| n.trim().parse().ok())
        .unwrap_or_else(|| {
            panic!(
                "pdfinfo gave no page count: {}",
                String::from_utf8_lossy(&out.stderr)
            )
        })
}

#[test]
#[ignore = "needs Chromium and poppler-utils: run with `cargo test --test html -- --ignored` (.ci/run does)"]
fn the_close_bore_tech_sheet_prints_on_two_pages_of_letter_and_of_a4() {
    let Some(browser) = chromium() else {
        panic!("Chromium is not installed (Debian package `chromium`): the print test cannot run");
    };
    let dir = std::env::temp_dir().join(format!("gonogo-{}-print", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let html = sheet(Path::new("engines-demo/limited2-close-bore.yaml"));
    assert!(
        html.find("Rules illegal, not proven or not checked") < html.find("Every rule in detail"),
        "the call comes before the detail"
    );
    // Letter is Chromium's default paper; A4 is what a user picks in the print dialogue,
    // written here as the CSS page size
    for (paper, extra) in [("letter", ""), ("A4", "<style>@page { size: A4; }</style>")] {
        let page = dir.join(format!("sheet-{paper}.html"));
        std::fs::write(&page, html.replace("</head>", &format!("{extra}</head>")))
            .unwrap_or_else(|e| panic!("{e}"));
        let pdf = dir.join(format!("sheet-{paper}.pdf"));
        let status = Command::new(&browser)
            .args([
                "--headless",
                "--no-sandbox",
                "--disable-gpu",
                "--no-first-run",
            ])
            .args(["--disable-background-networking", "--no-pdf-header-footer"])
            .arg(format!("--user-data-dir={}", dir.join("profile").display()))
            .arg(format!("--print-to-pdf={}", pdf.display()))
            .arg(format!("file://{}", page.display()))
            .output()
            .unwrap_or_else(|e| panic!("cannot start Chromium: {e}"));
        assert!(
            pdf.exists(),
            "no PDF: {}",
            String::from_utf8_lossy(&status.stderr)
        );
        let n = pages(&pdf);
        assert!((1..=2).contains(&n), "{paper}: {n} pages, more than two");
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_seals_a_declaration_records_are_on_page_one() {
    use gonogo::load::inspection::Seal;
    // the loader of the `inspection:` block is another branch's; the declaration is built here
    let loaded = gonogo::commands::load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut sources = gonogo::source::SourceMap::default();
    let path = Path::new("engines-demo/limited2-close-bore.yaml");
    let mut d = gonogo::load::load_declaration(path, &rulebook, &mut sources)
        .unwrap_or_else(|p| panic!("{p:?}"));
    d.inspection.seals_found = vec![Seal {
        number: "TVS-04417".to_string(),
        place: Some("intake to head, front left bolt".to_string()),
    }];
    d.inspection.seals_applied = vec![Seal {
        number: "TVS-05120".to_string(),
        place: None,
    }];
    let class = rulebook
        .class("limited2")
        .unwrap_or_else(|| panic!("limited2"));
    let report = gonogo::evaluate::check_engine(&rulebook, class, &d, None);
    let html = gonogo::report::html::page(&[report]);
    let detail = html.find("Every rule in detail").unwrap_or(0);
    for row in [
        "<tr><td>found</td><td>TVS-04417</td><td>intake to head, front left bolt</td></tr>",
        "<tr><td>applied</td><td>TVS-05120</td><td>—</td></tr>",
    ] {
        let at = html
            .find(row)
            .unwrap_or_else(|| panic!("no seal row {row}"));
        assert!(at < detail, "the seals come before the detail");
    }
}
