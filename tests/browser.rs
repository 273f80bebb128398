//! The catalog site in a real browser: headless Chromium opens the index and two entry
//! pages from the local disk, the test drives the filters as a reader would and checks
//! that every picture renders (no broken image, a non-empty box). Screenshots are kept
//! under target/browser-test/ as artefacts.
//!
//! The browser is driven through its DevTools protocol over a pipe (no network port):
//! messages are JSON texts ended by a NUL byte, read by the browser on its descriptor 3 and
//! written on its descriptor 4. Skipped with a note when no browser is installed
//! (`BILIN_BROWSER` names one explicitly).

mod common;

use serde_json::{Value, json};
use std::io::{BufRead, BufReader, Write};
use std::path::{Path, PathBuf};
use std::process::{Child, ChildStdin, Command, Stdio};
use std::sync::mpsc::{Receiver, RecvTimeoutError, channel};
use std::time::{Duration, Instant};

const TIMEOUT: Duration = Duration::from_secs(60);

fn find_browser() -> Option<PathBuf> {
    if let Some(p) = std::env::var_os("BILIN_BROWSER") {
        return Some(PathBuf::from(p));
    }
    let path = std::env::var_os("PATH")?;
    for dir in std::env::split_paths(&path) {
        for name in ["chromium", "chromium-browser"] {
            let p = dir.join(name);
            if p.is_file() {
                return Some(p);
            }
        }
    }
    None
}

/// A browser session over the DevTools pipe, attached to one page.
struct Browser {
    child: Child,
    input: ChildStdin,
    messages: Receiver<Value>,
    next_id: u64,
    session: String,
}

impl Browser {
    fn launch(exe: &Path, work: &Path) -> Browser {
        let profile = work.join("profile");
        let _ = std::fs::remove_dir_all(&profile);
        std::fs::create_dir_all(&profile).unwrap();
        let log = std::fs::File::create(work.join("browser.log")).unwrap();
        // the shell moves our pipes to descriptors 3 (commands) and 4 (replies)
        let mut child = Command::new("sh")
            .arg("-c")
            .arg(r#"exec "$@" 3<&0 4>&1 0</dev/null 1>/dev/null"#)
            .arg("sh")
            .arg(exe)
            .args([
                "--headless",
                "--no-sandbox",
                "--disable-gpu",
                "--disable-quic",
                "--no-first-run",
                "--disable-background-networking",
                "--disable-component-update",
                "--disable-sync",
                "--hide-scrollbars",
                "--remote-debugging-pipe",
            ])
            .arg(format!("--user-data-dir={}", profile.display()))
            .arg("about:blank")
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(log)
            .spawn()
            .expect("start the browser");
        let input = child.stdin.take().unwrap();
        let out = child.stdout.take().unwrap();
        let (tx, rx) = channel();
        std::thread::spawn(move || {
            let mut r = BufReader::new(out);
            let mut buf = Vec::new();
            while r.read_until(0, &mut buf).is_ok_and(|n| n > 0) {
                buf.pop();
                if let Ok(v) = serde_json::from_slice::<Value>(&buf)
                    && tx.send(v).is_err()
                {
                    break;
                }
                buf.clear();
            }
        });
        let mut b = Browser {
            child,
            input,
            messages: rx,
            next_id: 0,
            session: String::new(),
        };
        let target = b.call(None, "Target.createTarget", json!({"url": "about:blank"}));
        let id = target["targetId"].as_str().unwrap().to_string();
        let attached = b.call(
            None,
            "Target.attachToTarget",
            json!({"targetId": id, "flatten": true}),
        );
        b.session = attached["sessionId"].as_str().unwrap().to_string();
        b.page(
            "Emulation.setDeviceMetricsOverride",
            json!({"width": 1280, "height": 1000, "deviceScaleFactor": 1, "mobile": false}),
        );
        b
    }

    /// Send a command (to the browser, or to a page session) and wait for its reply.
    fn call(&mut self, session: Option<&str>, method: &str, params: Value) -> Value {
        self.next_id += 1;
        let id = self.next_id;
        let mut msg = json!({"id": id, "method": method, "params": params});
        if let Some(s) = session {
            msg["sessionId"] = json!(s);
        }
        let mut bytes = serde_json::to_vec(&msg).unwrap();
        bytes.push(0);
        self.input.write_all(&bytes).expect("write to the browser");
        self.input.flush().unwrap();
        let deadline = Instant::now() + TIMEOUT;
        loop {
            let left = deadline.saturating_duration_since(Instant::now());
            match self.messages.recv_timeout(left) {
                Ok(v) if v["id"] == json!(id) => {
                    if let Some(e) = v.get("error") {
                        panic!("{method}: the browser answered with an error: {e}");
                    }
                    return v["result"].clone();
                }
                Ok(_) => {} // an event
                Err(RecvTimeoutError::Timeout) => panic!("{method}: no answer in {TIMEOUT:?}"),
                Err(RecvTimeoutError::Disconnected) => {
                    panic!("{method}: the browser closed the pipe (see browser.log)")
                }
            }
        }
    }

    fn page(&mut self, method: &str, params: Value) -> Value {
        let s = self.session.clone();
        self.call(Some(&s), method, params)
    }

    /// Evaluate a script expression in the page; returns its value (promises awaited).
    fn eval(&mut self, expr: &str) -> Value {
        let r = self.page(
            "Runtime.evaluate",
            json!({"expression": expr, "returnByValue": true, "awaitPromise": true}),
        );
        if let Some(e) = r.get("exceptionDetails") {
            panic!("script error in `{expr}`: {e}");
        }
        r["result"]["value"].clone()
    }

    /// Open a URL and wait until the document and its images have loaded.
    fn open(&mut self, url: &str) {
        self.page("Page.navigate", json!({"url": url}));
        let deadline = Instant::now() + TIMEOUT;
        let probe = format!(
            "document.readyState === 'complete' && location.href === {}",
            json!(url)
        );
        while self.eval(&probe) != json!(true) {
            assert!(Instant::now() < deadline, "{url} did not load");
            std::thread::sleep(Duration::from_millis(50));
        }
    }

    fn screenshot(&mut self, path: &Path) {
        let r = self.page("Page.captureScreenshot", json!({"format": "png"}));
        let png = base64_decode(r["data"].as_str().unwrap());
        assert!(png.starts_with(b"\x89PNG"), "a PNG image");
        std::fs::write(path, png).unwrap();
    }

    /// Ask the browser to quit and wait for it (ended for good by `drop` if it hangs).
    fn close(mut self) {
        self.next_id += 1;
        let msg = json!({"id": self.next_id, "method": "Browser.close", "params": {}});
        let mut bytes = serde_json::to_vec(&msg).unwrap();
        bytes.push(0);
        let _ = self.input.write_all(&bytes);
        let deadline = Instant::now() + Duration::from_secs(10);
        while Instant::now() < deadline {
            if let Ok(Some(_)) = self.child.try_wait() {
                return;
            }
            std::thread::sleep(Duration::from_millis(50));
        }
    }
}

impl Drop for Browser {
    /// No browser outlives the test, even when an assertion fails half way.
    fn drop(&mut self) {
        if let Ok(None) = self.child.try_wait() {
            let _ = self.child.kill();
            let _ = self.child.wait();
        }
    }
}

fn base64_decode(s: &str) -> Vec<u8> {
    let val = |c: u8| -> u32 {
        match c {
            b'A'..=b'Z' => (c - b'A') as u32,
            b'a'..=b'z' => (c - b'a' + 26) as u32,
            b'0'..=b'9' => (c - b'0' + 52) as u32,
            b'+' => 62,
            b'/' => 63,
            _ => panic!("not base64: {c}"),
        }
    };
    let bytes: Vec<u8> = s.bytes().filter(|&c| c != b'=' && c != b'\n').collect();
    let mut out = Vec::with_capacity(bytes.len() * 3 / 4);
    for chunk in bytes.chunks(4) {
        let mut acc = 0u32;
        for (k, &c) in chunk.iter().enumerate() {
            acc |= val(c) << (18 - 6 * k);
        }
        let n = chunk.len() * 6 / 8;
        out.extend_from_slice(&acc.to_be_bytes()[1..1 + n]);
    }
    out
}

/// The rows of the index that are shown, as (name, family, laws, dim).
const VISIBLE_ROWS: &str = "Array.from(document.querySelectorAll('#entries tbody tr'))\
    .filter(r => !r.hidden && r.offsetParent !== null)\
    .map(r => [r.querySelector('a').textContent, r.dataset.family, r.dataset.laws, r.dataset.dim])";

/// Set a filter control as a reader would and let the page react.
fn set_filter(b: &mut Browser, id: &str, value: &str) {
    let ev = if id == "q" { "input" } else { "change" };
    b.eval(&format!(
        "(() => {{ const f = document.getElementById('f-{id}'); f.value = {}; \
         f.dispatchEvent(new Event('{ev}')); return f.value; }})()",
        json!(value)
    ));
}

fn visible(b: &mut Browser) -> Vec<(String, String, String, String)> {
    serde_json::from_value(b.eval(VISIBLE_ROWS)).unwrap()
}

/// Every image of the page has loaded and is drawn in a non-empty box.
fn check_pictures(b: &mut Browser, page: &str, expected: usize) {
    let imgs = b.eval(
        "Array.from(document.images).map(i => { const r = i.getBoundingClientRect(); \
         return {src: i.getAttribute('src'), complete: i.complete, w: i.naturalWidth, \
         h: i.naturalHeight, bw: r.width, bh: r.height}; })",
    );
    let imgs = imgs.as_array().unwrap();
    assert_eq!(imgs.len(), expected, "{page}: {imgs:?}");
    for i in imgs {
        assert_eq!(i["complete"], json!(true), "{page}: {i}");
        for k in ["w", "h", "bw", "bh"] {
            assert!(
                i[k].as_f64().unwrap() > 10.0,
                "{page}: broken or empty picture {i}"
            );
        }
    }
}

#[test]
fn catalog_site_in_a_real_browser() {
    let Some(exe) = find_browser() else {
        // written past the test harness's capture, so that the note shows in every log
        let _ = writeln!(
            std::io::stderr(),
            "note: no Chromium browser found (install Debian's `chromium`, or set BILIN_BROWSER); \
             the browser test is skipped"
        );
        return;
    };
    let work = Path::new(env!("CARGO_MANIFEST_DIR")).join("target/browser-test");
    let site = work.join("site");
    let _ = std::fs::remove_dir_all(&site);
    std::fs::create_dir_all(&work).unwrap();
    let (code, out, err) = common::run(&["catalog", "site", site.to_str().unwrap()]);
    assert_eq!(code, 0, "{out}{err}");
    let all = bilin::catalog::all_entries().unwrap();
    let url = |p: &str| format!("file://{}/{p}", site.display());

    let mut b = Browser::launch(&exe, &work);

    // the index: everything shown, then each filter as a reader uses it
    b.open(&url("index.html"));
    assert_eq!(visible(&mut b).len(), all.len());
    set_filter(&mut b, "family", "lie");
    let rows = visible(&mut b);
    let lie = all.iter().filter(|e| e.meta.family == "lie").count();
    assert_eq!(rows.len(), lie);
    assert!(rows.iter().all(|r| r.1 == "lie"));
    let count = b.eval("document.getElementById('count').textContent");
    assert_eq!(count, json!(format!("{lie} of {} entries", all.len())));
    // the filter state goes into the address, so the view can be bookmarked
    assert_eq!(b.eval("location.hash"), json!("#family=lie"));
    b.screenshot(&work.join("index-family-lie.png"));

    set_filter(&mut b, "family", "");
    set_filter(&mut b, "law", "associative");
    let rows = visible(&mut b);
    let names: Vec<&str> = rows.iter().map(|r| r.0.as_str()).collect();
    // Hamilton 1844: the quaternions are associative; Cayley 1845: the octonions are not
    assert!(names.contains(&"quaternions") && !names.contains(&"octonions"));
    assert!(
        rows.iter()
            .all(|r| r.2.split(' ').any(|l| l == "associative"))
    );
    set_filter(&mut b, "law", "");
    set_filter(&mut b, "dim", "8");
    let rows = visible(&mut b);
    assert!(rows.iter().all(|r| r.3 == "8") && rows.iter().any(|r| r.0 == "octonions"));
    set_filter(&mut b, "dim", "");
    set_filter(&mut b, "q", "sl");
    let names: Vec<String> = visible(&mut b).into_iter().map(|r| r.0).collect();
    assert!(names.contains(&"sl2".to_string()) && names.contains(&"sl3".to_string()));

    // an entry page with its tensor picture
    b.open(&url("entries/octonions.html"));
    check_pictures(&mut b, "octonions", 1);
    let h1 = b.eval("document.querySelector('h1').textContent");
    assert_eq!(h1, json!("octonions"));
    b.screenshot(&work.join("entry-octonions.png"));

    // an entry page with a stored scheme: two pictures
    b.open(&url("entries/matmul222.html"));
    check_pictures(&mut b, "matmul222", 2);
    b.eval("document.querySelector('h3').scrollIntoView()");
    b.screenshot(&work.join("entry-matmul222-scheme.png"));

    // a filtered view restored from a bookmarked address
    b.open(&url("index.html#family=matmul&dim=4"));
    let rows = visible(&mut b);
    let expected = all
        .iter()
        .filter(|e| e.meta.family == "matmul" && e.tensor().unwrap().dims()[0] == 4)
        .count();
    assert!(expected > 0);
    assert_eq!(rows.len(), expected);
    assert_eq!(
        b.eval("document.getElementById('f-family').value"),
        json!("matmul")
    );
    b.close();
    eprintln!("screenshots in {}", work.display());
}
