use trackfix_harness::manifest::Manifest;
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let m = Manifest::read(std::path::Path::new("host-tests/manifest.toml")).unwrap();
    let mut row = m
        .integrity
        .iter()
        .find(|r| r.name == args[1])
        .unwrap()
        .clone();
    row.epochs = args.get(2).map_or(1200, |a| a.parse().unwrap());
    let f = row.run().unwrap();
    println!("{:?}", f.delays_s);
}
