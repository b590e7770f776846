//! Integration tests: network — loading edge lists and node tables, the
//! structural summary against networkx, and the `inspect` command.

use std::io::Write;
use std::path::{Path, PathBuf};

use proptest::prelude::*;
use spreadplan::network::inspect::{
    connected_components, core_numbers, degree_assortativity, summarize,
};
use spreadplan::network::load::{load_edge_list, load_node_table, EdgeListOptions, LoadError};
use spreadplan::network::WeightMerge;

use crate::common::{data, spreadplan, tempdir};

fn write(dir: &Path, name: &str, text: &str) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

fn opts() -> EdgeListOptions {
    EdgeListOptions::default()
}

fn weighted(col: &str) -> EdgeListOptions {
    EdgeListOptions { weight_column: Some(col.into()), ..Default::default() }
}

/// The error message of a failed load.
fn err(path: &Path, o: &EdgeListOptions) -> String {
    match load_edge_list(path, o) {
        Ok(_) => panic!("{} loaded but should fail", path.display()),
        Err(e) => e.to_string(),
    }
}

// ---------------------------------------------------------------------------
// networkx reference values: tests/reference/networkx_reference.json, written
// by tests/reference/make_reference.py (networkx version recorded in the
// JSON, 3.6.1 when committed). Datasets: Zachary's karate club (Zachary
// 1977) and Les Misérables co-appearances (Knuth 1993), as shipped by
// networkx; the fixtures tests/data/karate.csv and lesmis.csv are written by
// the same script.

fn reference() -> serde_json::Value {
    let p =
        PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/networkx_reference.json");
    serde_json::from_str(&std::fs::read_to_string(p).unwrap()).unwrap()
}

fn check_against_networkx(name: &str, file: &str, o: &EdgeListOptions) {
    let all = reference();
    let version = all["networkx_version"].as_str().unwrap().to_owned();
    let r = &all["datasets"][name];
    let l = load_edge_list(&data(file), o).unwrap();
    let net = &l.network;
    let ctx = format!("{name} vs networkx {version} ({})", r["source"]);
    // Sizes: networkx number_of_nodes / number_of_edges.
    assert_eq!(net.node_count() as u64, r["nodes"].as_u64().unwrap(), "{ctx}");
    assert_eq!(net.edge_count() as u64, r["edges"].as_u64().unwrap(), "{ctx}");
    // Degree sequence by node id: networkx G.degree().
    for (id, d) in r["degree"].as_object().unwrap() {
        let v = l.nodes.index(id).unwrap_or_else(|| panic!("{ctx}: node {id} missing"));
        assert_eq!(net.degree(v) as u64, d.as_u64().unwrap(), "{ctx}: degree of {id}");
    }
    // Components: networkx connected_components.
    let c = connected_components(net);
    assert_eq!(c.count() as u64, r["components"].as_u64().unwrap(), "{ctx}");
    let mut sizes = c.sizes.clone();
    sizes.sort_unstable_by(|a, b| b.cmp(a));
    let want: Vec<u64> =
        r["component_sizes"].as_array().unwrap().iter().map(|x| x.as_u64().unwrap()).collect();
    assert_eq!(sizes, want, "{ctx}");
    // Core numbers: networkx core_number.
    let core = core_numbers(net);
    for (id, k) in r["core_number"].as_object().unwrap() {
        let v = l.nodes.index(id).unwrap();
        assert_eq!(core[v as usize] as u64, k.as_u64().unwrap(), "{ctx}: core of {id}");
    }
    let s = summarize(net);
    assert_eq!(s.max_core as u64, r["max_core"].as_u64().unwrap(), "{ctx}");
    // Transitivity: networkx transitivity (exact rational, so 1e-12).
    let t = r["transitivity"].as_f64().unwrap();
    assert!((s.clustering.unwrap() - t).abs() < 1e-12, "{ctx}: {:?} vs {t}", s.clustering);
    // Degree assortativity: networkx degree_assortativity_coefficient
    // (float roundoff in its mixing-matrix route, so 1e-9).
    let a = r["degree_assortativity"].as_f64().unwrap();
    let got = degree_assortativity(net).unwrap();
    assert!((got - a).abs() < 1e-9, "{ctx}: {got} vs {a}");
    assert_eq!(s.assortativity, Some(got));
}

#[test]
fn karate_matches_networkx() {
    check_against_networkx("karate", "karate.csv", &opts());
}

#[test]
fn lesmis_matches_networkx() {
    check_against_networkx("lesmis", "lesmis.csv", &opts());
    // The same file with its weights (co-appearance counts).
    check_against_networkx("lesmis", "lesmis.csv", &weighted("weight"));
    let l = load_edge_list(&data("lesmis.csv"), &weighted("3")).unwrap();
    let w = l.network.weights().unwrap();
    // Napoleon–Myriel has weight 1, Myriel–MlleBaptistine 8 (first rows of the fixture).
    let find = |a: &str, b: &str| {
        let (a, b) = (l.nodes.index(a).unwrap(), l.nodes.index(b).unwrap());
        let (a, b) = (a.min(b), a.max(b));
        l.network.edges().iter().position(|e| *e == [a, b]).unwrap()
    };
    assert_eq!(w[find("Napoleon", "Myriel")], 1.0);
    assert_eq!(w[find("Myriel", "MlleBaptistine")], 8.0);
}

// ---------------------------------------------------------------------------
// Formats. Expected values are counted by hand from the small inputs.

#[test]
fn formats_give_the_same_network() {
    let d = tempdir("load-formats");
    let texts = [
        ("c.csv", "source,target\na,b\nb,c\n"),
        ("t.tsv", "a\tb\nb\tc\n"),
        ("w.txt", "# comment\n  a   b \n\nb c\n"),
        ("s.csv", "from;to\r\na;b\r\nb;c"),
        ("bom.csv", "\u{feff}a,b\n  # indented comment\nb,c\n"),
        ("q.csv", "\"a\",\"b\"\n\"b\" , \"c\"\n"),
    ];
    for (name, text) in texts {
        let l = load_edge_list(&write(&d, name, text), &opts()).unwrap();
        assert_eq!((l.network.node_count(), l.network.edge_count()), (3, 2), "{name}");
        assert_eq!(l.nodes.id(0), "a", "{name}");
        assert_eq!(l.nodes.id(2), "c", "{name}");
    }
    let l = load_edge_list(&d.join("c.csv"), &opts()).unwrap();
    assert!(l.report.header);
    assert_eq!(l.report.delimiter, "comma");
    assert_eq!(load_edge_list(&d.join("w.txt"), &opts()).unwrap().report.delimiter, "whitespace");
    assert_eq!(load_edge_list(&d.join("s.csv"), &opts()).unwrap().report.delimiter, "semicolon");
}

#[test]
fn gzip_by_extension_and_by_magic() {
    let d = tempdir("load-gz");
    let text = "u,v\n1,2\n2,3\n3,1\n";
    for name in ["e.csv.gz", "e-no-extension"] {
        let f = std::fs::File::create(d.join(name)).unwrap();
        let mut gz = flate2::write::GzEncoder::new(f, flate2::Compression::default());
        gz.write_all(text.as_bytes()).unwrap();
        gz.finish().unwrap();
        let l = load_edge_list(&d.join(name), &opts()).unwrap();
        assert_eq!(l.network.edge_count(), 3, "{name}");
    }
    // The hash is of the decompressed bytes: equal to the plain file's.
    let plain = load_edge_list(&write(&d, "e.csv", text), &opts()).unwrap();
    let gz = load_edge_list(&d.join("e.csv.gz"), &opts()).unwrap();
    assert_eq!(plain.report.content_hash, gz.report.content_hash);
}

#[test]
fn self_loops_and_duplicates_are_counted() {
    let d = tempdir("load-dups");
    let f = write(&d, "e.csv", "a,b\nb,a\na,b\na,a\nb,c\nc,c\n");
    let l = load_edge_list(&f, &opts()).unwrap();
    assert_eq!((l.report.rows, l.report.self_loops_dropped, l.report.duplicates_merged), (6, 2, 2));
    assert_eq!(l.network.edge_count(), 2);
    // Directed: a→b and b→a differ, only the repeated a→b merges.
    let l = load_edge_list(&f, &EdgeListOptions { directed: true, ..opts() }).unwrap();
    assert_eq!((l.report.self_loops_dropped, l.report.duplicates_merged), (2, 1));
    assert_eq!(l.network.edge_count(), 3);
}

#[test]
fn duplicate_weights_merge_as_asked() {
    let d = tempdir("load-merge");
    let f = write(&d, "e.csv", "source,target,p\na,b,0.5\nb,a,0.2\n");
    let get = |merge| {
        let o = EdgeListOptions { weight_column: Some("p".into()), merge, directed: false };
        load_edge_list(&f, &o).unwrap().network.weights().unwrap()[0]
    };
    assert_eq!(get(WeightMerge::Max), 0.5);
    assert!((get(WeightMerge::Sum) - 0.7).abs() < 1e-6);
    assert_eq!(get(WeightMerge::First), 0.5);
    // 1 − (1 − 0.5)(1 − 0.2) = 0.6.
    assert!((get(WeightMerge::NoisyOr) - 0.6).abs() < 1e-6);
}

#[test]
fn large_integer_ids_and_mixed_ids_intern_consistently() {
    let d = tempdir("load-ids");
    // A large id beyond the dense cache goes through the hash each time; "07"
    // and "7" are different ids.
    let f = write(&d, "e.txt", "900000 1\n1 2\n2 900000\n7 07\n900000 7\n");
    let l = load_edge_list(&f, &opts()).unwrap();
    assert_eq!(l.network.node_count(), 5);
    assert_eq!(l.network.edge_count(), 5);
    let v = l.nodes.index("900000").unwrap();
    assert_eq!(l.network.degree(v), 3);
}

// ---------------------------------------------------------------------------
// Errors: file, line and reason, showing the bad value.

#[test]
fn malformed_inputs_name_file_line_and_value() {
    let d = tempdir("load-errors");
    let cases: [(&str, &str, EdgeListOptions, &str); 12] = [
        (
            "one.csv",
            "a,b\nlonely\n",
            opts(),
            "one.csv:2: expected at least 2 columns, found 1: \"lonely\"",
        ),
        ("emptyid.csv", "a,b\n,c\n", opts(), "emptyid.csv:2: empty node id"),
        (
            "nan.csv",
            "s,t,w\na,b,0.5\nb,c,NaN\n",
            weighted("w"),
            ":3: weight \"NaN\" is not a number (NaN)",
        ),
        ("neg.csv", "s,t,w\na,b,-0.5\n", weighted("w"), ":2: weight \"-0.5\" is negative"),
        ("inf.csv", "s,t,w\na,b,inf\n", weighted("w"), ":2: weight \"inf\" is infinite"),
        ("word.csv", "s,t,w\na,b,high\n", weighted("w"), ":2: weight \"high\" is not a number"),
        ("big.csv", "s,t,w\na,b,1e300\n", weighted("w"), "too large for 32-bit"),
        (
            "short.csv",
            "s,t,w\na,b,1\nb,c\n",
            weighted("w"),
            ":3: missing weight column 3 (line has 2 columns)",
        ),
        (
            "noname.csv",
            "s,t,w\na,b,1\n",
            weighted("weight"),
            ":1: no weight column named \"weight\"",
        ),
        ("nocol.csv", "a,b\n", weighted("1"), ":1: weight column 1 must be 3 or more"),
        ("empty.csv", "", opts(), "empty.csv: file is empty"),
        ("comments.csv", "# only\n\n# comments\n", opts(), "comments.csv: no edges found"),
    ];
    for (name, text, o, want) in cases {
        let msg = err(&write(&d, name, text), &o);
        assert!(msg.contains(want), "{name}: got {msg:?}, want {want:?}");
        assert!(!msg.contains('\n'), "{name}: one line");
    }
    // Header only.
    let msg = err(&write(&d, "header.csv", "source,target\n"), &opts());
    assert!(msg.ends_with("header.csv: no edges found"), "{msg}");
    // Missing file.
    let e = load_edge_list(&d.join("absent.csv"), &opts()).unwrap_err();
    assert!(matches!(e, LoadError::Io { .. }));
    // Invalid UTF-8 in an id.
    std::fs::write(d.join("utf.csv"), b"a,b\n\xff\xfe,c\n").unwrap();
    assert!(err(&d.join("utf.csv"), &opts()).contains(":2: node id"));
    // A corrupt gzip stream is an I/O error, not a panic.
    std::fs::write(d.join("bad.gz"), b"\x1f\x8b\x08\x00garbage").unwrap();
    assert!(load_edge_list(&d.join("bad.gz"), &opts()).is_err());
}

// ---------------------------------------------------------------------------
// Node tables.

#[test]
fn node_table_reads_attributes_and_defaults() {
    let d = tempdir("nodes-ok");
    let e = write(&d, "e.csv", "a,b\nb,c\nc,d\n");
    let n = write(
        &d,
        "n.tsv",
        "ID\tgroup\tcost\tuptake\timmune\tnote\na\tkids\t2\t0.5\tyes\tx\nc\tadults\t\t1\t0\ty\nd\t\t0.5\t0\tFALSE\tz\n",
    );
    let mut l = load_edge_list(&e, &opts()).unwrap();
    let r = load_node_table(&n, &mut l).unwrap();
    assert_eq!((r.rows, r.unlisted), (3, 1));
    assert_eq!(r.columns, vec!["group", "cost", "uptake", "immune"]);
    let t = &l.nodes;
    let (a, b, c, dd) = (0, 1, 2, 3);
    assert_eq!(t.group_of(a), Some("kids"));
    assert_eq!(t.group_of(b), Some("unlisted"));
    assert_eq!(t.group_of(dd), Some("unlisted"));
    assert_eq!((t.cost_of(a), t.cost_of(b), t.cost_of(c), t.cost_of(dd)), (2.0, 1.0, 1.0, 0.5));
    assert_eq!((t.uptake_of(a), t.uptake_of(b), t.uptake_of(dd)), (0.5, 1.0, 0.0));
    assert_eq!((t.is_immune(a), t.is_immune(b), t.is_immune(c)), (true, false, false));
}

#[test]
fn node_table_errors_name_line_and_value() {
    let d = tempdir("nodes-err");
    let e = write(&d, "e.csv", "a,b\nb,c\n");
    let cases = [
        ("absent.csv", "id,group\na,x\nzed,y\n", ":3: node id \"zed\" is not in the network"),
        ("dup.csv", "id\na\nb\na\n", ":4: duplicate node id \"a\" (first on line 2)"),
        ("uptake.csv", "id,uptake\na,1.5\n", ":2: uptake \"1.5\" must be a number in [0, 1]"),
        ("cost.csv", "id,cost\na,0\n", ":2: cost \"0\" must be a finite number > 0"),
        ("costnan.csv", "id,cost\na,NaN\n", ":2: cost \"NaN\" must be a finite number > 0"),
        (
            "immune.csv",
            "id,immune\na,maybe\n",
            ":2: immune \"maybe\" must be 0/1/true/false/yes/no",
        ),
        ("noid.csv", "name,group\na,x\n", ":1: the header needs an id column"),
        ("cols.csv", "id,group\na\n", ":2: expected 2 columns as in the header, found 1"),
        ("empty.csv", "", "node table is empty"),
    ];
    for (name, text, want) in cases {
        let mut l = load_edge_list(&e, &opts()).unwrap();
        let msg = load_node_table(&write(&d, name, text), &mut l).unwrap_err().to_string();
        assert!(msg.contains(want), "{name}: got {msg:?}, want {want:?}");
    }
}

// ---------------------------------------------------------------------------
// No input makes the loader panic (proptest; random bytes and mutations of
// valid files). Either Ok or a typed LoadError.

const VALID: &[&str] = &[
    "source,target,weight\na,b,0.5\nb,c,1\n# c\nc,a,0.25\n",
    "1 2\n2 3\n3 1\n4 4\n",
    "from\tto\n10\t20\n20\t30\n",
];

fn load_never_panics(bytes: &[u8], dir: &Path, weight: bool) {
    let f = dir.join("fuzz.csv");
    std::fs::write(&f, bytes).unwrap();
    for directed in [false, true] {
        let o = EdgeListOptions {
            directed,
            weight_column: weight.then(|| "3".to_owned()),
            ..Default::default()
        };
        match load_edge_list(&f, &o) {
            Ok(mut l) => {
                assert!(l.network.edge_count() as u64 <= l.report.rows);
                let _ = summarize(&l.network);
                // The same bytes as a node table.
                let _ = load_node_table(&f, &mut l);
            }
            Err(LoadError::Io { .. } | LoadError::Parse { .. } | LoadError::Invalid { .. }) => {}
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 128, ..ProptestConfig::default() })]

    #[test]
    fn random_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..300),
                                weight in any::<bool>()) {
        let d = tempdir("fuzz-bytes");
        load_never_panics(&bytes, &d, weight);
    }

    #[test]
    fn mutated_files_never_panic(which in 0..VALID.len(),
                                 edits in proptest::collection::vec(
                                     (any::<prop::sample::Index>(), any::<u8>(), 0..3u8), 1..8),
                                 weight in any::<bool>()) {
        let mut bytes = VALID[which].as_bytes().to_vec();
        for (at, b, op) in edits {
            let i = at.index(bytes.len() + 1);
            match op {
                0 if i < bytes.len() => bytes[i] = b,
                1 => bytes.insert(i.min(bytes.len()), b),
                _ if i < bytes.len() => { bytes.remove(i); }
                _ => bytes.push(b),
            }
        }
        let d = tempdir("fuzz-mut");
        load_never_panics(&bytes, &d, weight);
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]

    /// The fast path (plain `u,v` integer lines) and the general parser
    /// (taken when a weight column is read) give the same network and ids.
    #[test]
    fn fast_and_general_paths_agree(
        edges in proptest::collection::vec((0u32..3000, 0u32..3000, 0u8..4), 1..400)
    ) {
        let d = tempdir("fast-general");
        let mut plain = String::new();
        let mut with_w = String::new();
        for &(u, v, style) in &edges {
            // Mix forms: leading zeros and spaces go to the general parser
            // inside the plain file too.
            let (a, b) = match style {
                0 => (format!("0{u}"), v.to_string()),
                1 => (format!(" {u}"), format!("{v} ")),
                _ => (u.to_string(), v.to_string()),
            };
            plain.push_str(&format!("{a},{b}\n"));
            with_w.push_str(&format!("{a},{b},1\n"));
        }
        let p = load_edge_list(&write(&d, "p.csv", &plain), &opts()).unwrap();
        let w = load_edge_list(&write(&d, "w.csv", &with_w), &weighted("3")).unwrap();
        prop_assert_eq!(p.network.edges(), w.network.edges());
        prop_assert_eq!(p.nodes.len(), w.nodes.len());
        for v in 0..p.nodes.len() as u32 {
            prop_assert_eq!(p.nodes.id(v), w.nodes.id(v));
        }
        prop_assert_eq!(p.report.duplicates_merged, w.report.duplicates_merged);
        prop_assert_eq!(p.report.self_loops_dropped, w.report.self_loops_dropped);
    }
}

/// The same agreement on a file large enough for the radix sort, the
/// sectioned transpose and the id table's dense and hashed lookups: 60 000
/// rows mixing canonical ids, leading zeros, padded ids, huge ids and text
/// ids. Expected values: the general parser and the sort-first build.
#[test]
fn fast_and_general_paths_agree_on_a_large_mixed_file() {
    let d = tempdir("fast-general-large");
    let mut x = 3u64;
    let mut next = |k: u64| {
        // 64-bit LCG, Knuth MMIX constants.
        x = x.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (x >> 33) % k
    };
    let mut plain = String::from("source,target\n");
    let mut with_w = String::from("source,target,w\n");
    for _ in 0..60_000 {
        let id = |style: u64, v: u64| match style {
            0 => format!("0{v}"),
            1 => format!(" {v}"),
            2 => format!("{}", 4_000_000_000u64 + v),
            3 => format!("n{v}"),
            _ => v.to_string(),
        };
        let (su, sv) = (next(12), next(12));
        let (a, b) = (id(su, next(20_000)), id(sv, next(20_000)));
        plain.push_str(&format!("{a},{b}\n"));
        with_w.push_str(&format!("{a},{b},1\n"));
    }
    let p = load_edge_list(&write(&d, "p.csv", &plain), &opts()).unwrap();
    let w = load_edge_list(&write(&d, "w.csv", &with_w), &weighted("w")).unwrap();
    assert_eq!(p.network.edges(), w.network.edges());
    assert_eq!(p.network.out_rows(), w.network.out_rows());
    assert_eq!(p.nodes.len(), w.nodes.len());
    for v in 0..p.nodes.len() as u32 {
        assert_eq!(p.nodes.id(v), w.nodes.id(v));
        assert_eq!(p.nodes.index(p.nodes.id(v)), Some(v));
    }
    assert_eq!(p.report.duplicates_merged, w.report.duplicates_merged);
    assert_eq!(p.report.self_loops_dropped, w.report.self_loops_dropped);
    assert_eq!(p.report.rows, 60_000);
    assert_eq!(p.report.content_hash, fnv1a_hex(plain.as_bytes()));
    assert_eq!(w.report.content_hash, fnv1a_hex(with_w.as_bytes()));
}

/// FNV-1a, 64 bit, written out from its definition (Fowler, Noll & Vo;
/// offset basis 0xcbf29ce484222325, prime 0x100000001b3), as lower-case hex.
fn fnv1a_hex(bytes: &[u8]) -> String {
    let mut h = 0xcbf2_9ce4_8422_2325u64;
    for &b in bytes {
        h = (h ^ b as u64).wrapping_mul(0x0000_0100_0000_01b3);
    }
    format!("{h:016x}")
}

/// The content hash covers every byte of the file whichever parser took
/// each line: a BOM, CRLF endings, comments, blank and padded lines between
/// fast-path integer lines, and no final newline.
#[test]
fn content_hash_is_fnv1a_of_the_file() {
    let d = tempdir("load-hash");
    let mut text = String::from("\u{feff}source,target\r\n# comment\r\n");
    for k in 0..3000u32 {
        text.push_str(&format!("{},{}\n", k % 97, (k * 31) % 89));
        if k % 400 == 7 {
            text.push_str(" 5 , 06\n\n#x\n");
        }
    }
    text.push_str("1,2");
    let f = write(&d, "h.csv", &text);
    let l = load_edge_list(&f, &opts()).unwrap();
    assert_eq!(l.report.content_hash, fnv1a_hex(text.as_bytes()));
    assert_eq!(l.report.rows, 3000 + 8 + 1);
}

// ---------------------------------------------------------------------------
// The binary.

#[test]
fn cli_corrupted_file_exits_2_with_line_number() {
    let d = tempdir("cli-corrupt");
    let mut text = std::fs::read_to_string(data("karate.csv")).unwrap();
    text = text.replacen("0,5\n", "0;;5x\n", 1);
    let lines_before = text.split("0;;5x").next().unwrap().matches('\n').count();
    let f = write(&d, "karate-corrupt.csv", &text);
    let out = spreadplan(&["inspect", f.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    assert!(out.stdout.is_empty(), "no partial output");
    let err = String::from_utf8(out.stderr).unwrap();
    assert_eq!(err.trim_end().lines().count(), 1, "{err}");
    let want = format!("karate-corrupt.csv:{}:", lines_before + 1);
    assert!(err.contains(&want), "{err} should name {want}");
}

#[test]
fn cli_inspect_json_has_the_keys() {
    let out = spreadplan(&["inspect", data("karate.csv").to_str().unwrap(), "--format", "json"]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    for key in [
        "nodes",
        "edges",
        "self_loops_dropped",
        "duplicates_merged",
        "mean_degree",
        "mean_sq_degree",
        "max_degree",
        "mean_excess_degree",
        "components",
        "largest_component",
        "second_largest_component",
        "clustering",
        "assortativity",
        "max_core",
        "threshold_estimate",
    ] {
        assert!(v.get(key).is_some(), "missing key {key}");
    }
    // Zachary 1977 via networkx: 34 nodes, 78 edges.
    assert_eq!((v["nodes"].as_u64(), v["edges"].as_u64()), (Some(34), Some(78)));
    // κ = (⟨k²⟩ − ⟨k⟩)/⟨k⟩ from the networkx degree sequence: Σk = 156,
    // Σk² = 1212, so κ = (1212 − 156)/156.
    let kappa = v["mean_excess_degree"].as_f64().unwrap();
    assert!((kappa - (1212.0 - 156.0) / 156.0).abs() < 1e-12);
    assert!((v["threshold_estimate"].as_f64().unwrap() - 156.0 / 1056.0).abs() < 1e-12);
}

#[test]
fn cli_inspect_directed_and_nodes() {
    let d = tempdir("cli-directed");
    let e = write(&d, "e.csv", "a,b\nb,c\nc,a\nc,d\n");
    let n = write(&d, "n.csv", "id,group\na,x\n");
    let out = spreadplan(&[
        "inspect",
        e.to_str().unwrap(),
        "--directed",
        "--nodes",
        n.to_str().unwrap(),
        "--format",
        "json",
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["strong_components"].as_u64(), Some(2));
    assert_eq!(v["largest_strong_component"].as_u64(), Some(3));
    assert_eq!(v["node_table"]["unlisted"].as_u64(), Some(3));
    let out = spreadplan(&["inspect", e.to_str().unwrap(), "--merge-weights", "mean"]);
    assert_eq!(out.status.code(), Some(2));
    let out = spreadplan(&["inspect", e.to_str().unwrap()]);
    assert!(String::from_utf8(out.stdout).unwrap().contains("threshold estimate"));
}
