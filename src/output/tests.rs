//! The output rules on real files: links, devices, FIFOs, missing directories, leftovers,
//! and concurrent writers.

use super::*;
use std::os::unix::fs::FileTypeExt;

fn scratch(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("bilin-output-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn s(p: &Path) -> String {
    p.to_str().unwrap().to_string()
}

fn names_in(d: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(d)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    v.sort();
    v
}

fn put(t: &Target, text: &str) -> Replaced {
    t.replace(|_| Ok(Some(text.to_string()))).unwrap()
}

#[test]
fn regular_files_are_replaced_and_nothing_is_left_behind() {
    let d = scratch("regular");
    let p = d.join("out.json");
    let t = Target::resolve(&s(&p)).unwrap();
    assert_eq!(t.kind, Kind::Missing);
    t.check_writable(4096).unwrap();
    assert!(names_in(&d).is_empty(), "the probe is removed");
    assert_eq!(put(&t, "one"), Replaced::Written);
    let t = Target::resolve(&s(&p)).unwrap();
    assert_eq!(t.kind, Kind::Regular);
    assert_eq!(put(&t, "two"), Replaced::Written);
    assert_eq!(std::fs::read_to_string(&p).unwrap(), "two");
    // a refusal and an error of the decision leave the file as it was, and no temporary
    assert_eq!(t.replace(|_| Ok(None)).unwrap(), Replaced::Unchanged);
    assert!(t.replace(|_| Err(Error::Invalid("no".into()))).is_err());
    assert_eq!(std::fs::read_to_string(&p).unwrap(), "two");
    assert_eq!(names_in(&d), vec!["out.json"]);
    // a missing file that the decision does not want stays missing
    let q = d.join("none.json");
    let t = Target::resolve(&s(&q)).unwrap();
    assert_eq!(
        t.replace(|cur| {
            assert!(cur.is_none());
            Ok(None)
        })
        .unwrap(),
        Replaced::Unchanged
    );
    assert!(!q.exists());
    std::fs::remove_dir_all(&d).ok();
}

#[test]
fn links_are_followed_and_kept() {
    let d = scratch("links");
    let real = d.join("real.json");
    std::fs::write(&real, "old").unwrap();
    let link = d.join("link.json");
    std::os::unix::fs::symlink(&real, &link).unwrap();
    let t = Target::resolve(&s(&link)).unwrap();
    assert_eq!(t.kind, Kind::Regular);
    t.replace(|cur| {
        assert_eq!(cur, Some("old"));
        Ok(Some("new".into()))
    })
    .unwrap();
    assert!(
        std::fs::symlink_metadata(&link)
            .unwrap()
            .file_type()
            .is_symlink()
    );
    assert_eq!(std::fs::read_to_string(&real).unwrap(), "new");
    // a dangling link is refused with its target named
    let dangling = d.join("dangling.json");
    std::os::unix::fs::symlink(d.join("gone.json"), &dangling).unwrap();
    let e = Target::resolve(&s(&dangling)).unwrap_err().to_string();
    assert!(
        e.contains("symbolic link") && e.contains("gone.json"),
        "{e}"
    );
    std::fs::remove_dir_all(&d).ok();
}

#[test]
fn devices_and_fifos_are_written_through_or_refused() {
    let t = Target::resolve("/dev/null").unwrap();
    assert_eq!(t.kind, Kind::Stream);
    t.check_writable(100).unwrap();
    assert_eq!(put(&t, "x"), Replaced::Written);
    assert!(
        std::fs::metadata("/dev/null")
            .unwrap()
            .file_type()
            .is_char_device()
    );
    let d = scratch("fifo");
    let e = Target::resolve(&s(&d)).unwrap_err().to_string();
    assert!(e.contains("directory"), "{e}");
    let e = Target::resolve(&s(&d.join("no/such/dir/out.json")))
        .unwrap_err()
        .to_string();
    assert!(e.contains("does not exist"), "{e}");
    let fifo = d.join("pipe");
    let c = std::ffi::CString::new(s(&fifo)).unwrap();
    // SAFETY: mkfifo with a valid NUL-terminated path.
    assert_eq!(unsafe { libc::mkfifo(c.as_ptr(), 0o600) }, 0);
    let t = Target::resolve(&s(&fifo)).unwrap();
    assert_eq!(t.kind, Kind::Stream);
    // no reader: an error at once, not a hang
    let e = t.replace(|_| Ok(Some("x".into()))).unwrap_err().to_string();
    assert!(e.contains("no process is reading"), "{e}");
    let reader = {
        let fifo = fifo.clone();
        std::thread::spawn(move || std::fs::read_to_string(fifo).unwrap())
    };
    // the reader opens the FIFO; retry until it is there
    let mut written = false;
    for _ in 0..500 {
        if t.replace(|_| Ok(Some("through".into()))).is_ok() {
            written = true;
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(10));
    }
    assert!(written);
    assert_eq!(reader.join().unwrap(), "through");
    assert!(std::fs::metadata(&fifo).unwrap().file_type().is_fifo());
    std::fs::remove_dir_all(&d).ok();
}

#[test]
fn temporaries_of_dead_processes_are_removed() {
    let d = scratch("stale");
    let p = d.join("r.json");
    std::fs::write(d.join(".r.json.bilin-tmp-999999999-0"), "partial").unwrap();
    std::fs::write(d.join(".other.json.bilin-tmp-999999999-0"), "kept").unwrap();
    put(&Target::resolve(&s(&p)).unwrap(), "done");
    assert_eq!(
        names_in(&d),
        vec![".other.json.bilin-tmp-999999999-0", "r.json"]
    );
    std::fs::remove_dir_all(&d).ok();
}

#[test]
fn concurrent_writers_keep_the_smallest() {
    // each writer replaces the number in the file only by a smaller one
    let d = scratch("concurrent");
    let p = d.join("best.txt");
    let handles: Vec<_> = (0..8u64)
        .map(|i| {
            let p = s(&p);
            std::thread::spawn(move || {
                for round in 0..20u64 {
                    let mine = 1000 - 37 * i - round * 3 + (i * round) % 11;
                    let t = Target::resolve(&p).unwrap();
                    t.replace(|cur| {
                        let old = cur.and_then(|c| c.trim().parse::<u64>().ok());
                        Ok(match old {
                            Some(o) if o <= mine => None,
                            _ => Some(format!("{mine}\n")),
                        })
                    })
                    .unwrap();
                }
            })
        })
        .collect();
    for h in handles {
        h.join().unwrap();
    }
    let want = (0..8u64)
        .flat_map(|i| (0..20u64).map(move |r| 1000 - 37 * i - r * 3 + (i * r) % 11))
        .min()
        .unwrap();
    assert_eq!(
        std::fs::read_to_string(&p).unwrap().trim(),
        want.to_string()
    );
    assert_eq!(names_in(&d), vec!["best.txt"]);
    std::fs::remove_dir_all(&d).ok();
}
