use fibrewise_core::normalization::*;
use fibrewise_core::*;
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let p: u64 = args[1].parse().unwrap();
    let names: Vec<String> = args[2].split(',').map(String::from).collect();
    let r = Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap();
    let gens: Vec<_> = args[3..].iter().map(|t| parse::parse_poly(&r, t).unwrap()).collect();
    let t = std::time::Instant::now();
    let nn = noether_normalization(&r, &gens, &Options::default(), &Control::new()).unwrap();
    println!("{:?} {:.3}s", nn.strategy, t.elapsed().as_secs_f64());
    println!("{:#?}", nn.to_text());
    let t = std::time::Instant::now();
    println!("{:?} {:.3}s", nn.verify(&gens, &Control::new()).unwrap(), t.elapsed().as_secs_f64());
}
