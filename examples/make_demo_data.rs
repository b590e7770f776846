//! Remakes the bundled demo inputs in `demo-data/` from spreadplan's own
//! generators, deterministically (fixed seeds): run
//! `cargo run --release --example make_demo_data` and commit the result.
//!
//! Everything here is invented for the demo — the places, the app, the
//! survey and every number (group costs and uptakes are round
//! illustrative values, not estimates of anything).
//!
//! * `marrowby/` — Marrowby, a fictional town of 3000 people in
//!   households, classrooms, workplaces and care homes (the `town`
//!   generator), with a node table giving each person's group, a cost per
//!   dose and an uptake probability.
//! * `pebblepost/` — the friendship network of Pebblepost, a fictional
//!   neighbourhood-noticeboard app: a Barabási–Albert graph (preferential
//!   attachment, the usual shape of app friendships) of 2000 members.
//! * `harrowgate-survey.csv` — a fictional contact survey of 1200
//!   respondents (degree,count), drawn from a negative binomial law.

use std::io::Write;
use std::path::Path;

use flate2::write::GzEncoder;
use flate2::Compression;
use spreadplan::degree::DegreeDistribution;
use spreadplan::network::generate::{barabasi_albert, town, TownConfig};
use spreadplan::network::load::write_edge_list;
use spreadplan::network::NodeTable;

fn gz(path: &Path, write: impl FnOnce(&mut Vec<u8>)) {
    let mut raw = Vec::new();
    write(&mut raw);
    // Fixed header (no file name, no time stamp) so the bytes are reproducible.
    let mut enc = GzEncoder::new(Vec::new(), Compression::best());
    enc.write_all(&raw).unwrap();
    std::fs::write(path, enc.finish().unwrap()).unwrap();
}

fn main() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("demo-data");
    std::fs::create_dir_all(root.join("marrowby")).unwrap();
    std::fs::create_dir_all(root.join("pebblepost")).unwrap();

    // Marrowby.
    let t = town(&TownConfig { people: 3000, ..TownConfig::default() }, 20_261_202).unwrap();
    gz(&root.join("marrowby/contacts.csv.gz"), |w| {
        write_edge_list(&mut *w, &t.network, &t.nodes).unwrap()
    });
    // Invented per-group dose cost (outreach effort) and uptake.
    let terms = |g: &str| match g {
        "child" => (1.0, 0.80),
        "adult" => (1.0, 0.70),
        "elder" => (1.5, 0.90),
        "care-home resident" => (2.0, 0.95),
        "care worker" => (1.0, 0.85),
        _ => (1.0, 1.0),
    };
    let mut people = String::from("id,group,cost,uptake\n");
    for v in 0..t.network.node_count() as u32 {
        let g = t.nodes.group_of(v).unwrap_or("adult");
        let (c, u) = terms(g);
        people.push_str(&format!("{},{g},{c},{u}\n", t.nodes.id(v)));
    }
    std::fs::write(root.join("marrowby/people.csv"), people).unwrap();

    // Pebblepost.
    let net = barabasi_albert(2000, 3, 7_070_707).unwrap();
    let ids = NodeTable::from_ids((0..2000).map(|i| format!("member{i:04}"))).unwrap();
    gz(&root.join("pebblepost/friends.csv.gz"), |w| write_edge_list(&mut *w, &net, &ids).unwrap());

    // Harrowgate survey.
    let law = DegreeDistribution::from_spec("negbin:mean=7,dispersion=0.9").unwrap();
    let sample = law.sample_degrees(1200, 1_234_567);
    let mut counts: Vec<u64> = Vec::new();
    for d in sample {
        let d = d as usize;
        if counts.len() <= d {
            counts.resize(d + 1, 0);
        }
        counts[d] += 1;
    }
    let mut table = String::from(
        "# Harrowgate contact survey (fictional): contacts named per respondent\ndegree,count\n",
    );
    for (k, c) in counts.iter().enumerate().filter(|(_, c)| **c > 0) {
        table.push_str(&format!("{k},{c}\n"));
    }
    std::fs::write(root.join("harrowgate-survey.csv"), table).unwrap();
}
