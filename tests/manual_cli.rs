//! Shell completions and man pages, generated from the command-line definitions: every
//! command gets a page, and the options the binary accepts appear in them.

mod common;

use common::run as bilin;

#[test]
fn completions_name_the_commands_for_every_shell() {
    for shell in ["bash", "zsh", "fish", "elvish", "powershell"] {
        let (code, out, err) = bilin(&["completions", shell]);
        assert_eq!(code, 0, "{shell}: {err}");
        for word in ["analyze", "draw", "catalog", "progress-every"] {
            assert!(out.contains(word), "{shell} completion lacks {word}");
        }
    }
    assert_eq!(bilin(&["completions", "tcsh-like"]).0, 2);
}

#[test]
fn manual_pages_cover_every_command_and_option() {
    let (code, out, _) = bilin(&["manual"]);
    assert_eq!(code, 0);
    assert!(out.starts_with(".ie") && out.contains(".TH bilin 1"));
    assert!(out.contains("bilin\\-draw(1)"));
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/target/test-man");
    let _ = std::fs::remove_dir_all(dir);
    let (code, out, err) = bilin(&["manual", "--dir", dir]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("man pages"));
    let page = |name: &str| {
        std::fs::read_to_string(format!("{dir}/{name}.1"))
            .unwrap_or_else(|_| panic!("no page {name}.1"))
    };
    for (name, option) in [
        ("bilin-analyze", "\\-\\-expect"),
        ("bilin-identify", "\\-\\-json"),
        ("bilin-search", "\\-\\-quiet"),
        ("bilin-catalog-site", "\\-\\-only"),
        ("bilin-draw-tensor", "\\-\\-axis"),
        ("bilin-draw-blocks", "\\-\\-sizes"),
        ("bilin-verify", "\\-\\-svg"),
    ] {
        assert!(page(name).contains(option), "{name} lacks {option}");
    }
    assert!(page("bilin").contains("bilin\\-catalog(1)"));
}
