"""The examples each sub-command's ``--help`` ends with."""

EPILOG_CHECK = """examples:
  fitkin check viscosity.csv
  fitkin check run1.csv run2.xlsx --sheet "Run 2"
  fitkin check visc.csv --unit T=degC --unit viscosity="uPa s"   (for headers without units)
"""
EPILOG_FIT = """examples:
  fitkin fit argon_visc.csv --formula Ar --out fit-argon
  fitkin fit visc.csv cond.csv --molar-mass "83.798 g/mol" --monatomic --name krypton --out fit-kr
  fitkin fit visc.csv --formula Ar --property viscosity --order 2 --out fit2 --force
  fitkin fit visc.csv --formula Ar --potential lj,mie,exp6 --out compare
  fitkin fit visc.csv cond.csv --gas co2.toml --out fit-co2
  fitkin fit visc.csv --formula Ar --sample --seed 7 --calibrate lab-B=1% --out fit-post
"""
EPILOG_PREDICT = """examples:
  fitkin predict fit-argon/parameters.json --temperatures 200:1000:100
  fitkin predict fit-argon/parameters.json --temperatures 300,400,500 --pressure "1 bar" --out table.csv
  fitkin predict fit-argon/parameters.json --temperatures 250:350:25 --band 0.95 --format json
  fitkin predict fit-argon/parameters.json -T 300:600:100 --with fit-helium/parameters.json --x1 0.25,0.5
  fitkin predict fit-argon/parameters.json -T 300 --with fit-helium/parameters.json --interaction mix/interaction.json --x1 0.5 --band 0.95
"""
EPILOG_REPORT = """examples:
  fitkin report fit-argon/parameters.json
  fitkin report fit-argon/parameters.json --out /tmp/argon-report --force
"""
EPILOG_PLAN = """examples:
  fitkin plan fit-argon/parameters.json --range 200:1000:5 --points 4 --uncertainty 0.3% --goal viscosity@1000K
  fitkin plan fit-argon/parameters.json --range 250:700:10 --points 6 --uncertainty 0.3% --out plan-ar
  fitkin plan --formula Ar --critical "Tc=150.7 K, Pc=4.86 MPa" --range 200:1000:10 --points 8 --uncertainty 0.5%
"""
EPILOG_BATCH = """examples:
  fitkin batch gases.toml --out batch-run             (one worker process per core)
  fitkin batch gases.toml --out batch-run --jobs 1    (one job after another; a rerun skips finished jobs)
  fitkin batch gases.toml --out /shared/run --scheduler tcp://cluster-head:8786 --library fits.sqlite
"""
EPILOG_LIBRARY = """examples:
  fitkin library add fits.sqlite fit-argon fit-krypton --label "lab run 3"
  fitkin library list fits.sqlite --gas argon
  fitkin library show fits.sqlite argon --potential mie
  fitkin library export fits.sqlite argon --out argon-again
  fitkin library add fits.sqlite ar-he            (a folder fitkin mix wrote)
  fitkin library show fits.sqlite argon+helium    (an unlike pair: both names, either order)
"""
EPILOG_MIX = """examples:
  fitkin mix fit-argon/parameters.json fit-helium/parameters.json ar-he_viscosity.csv --out ar-he
  fitkin mix ar.json he.json mix.csv d12.csv --pressure "1 atm" --rule halgren --fit-deviations --out ar-he-dev
  fitkin mix ar.json he.json mix.csv --sample --seed 3 --prior sigma12=gaussian:3.0,0.1 --out ar-he-post
  fitkin mix ar.json he.json mix.csv --pure-table Ar=argon_visc.csv --pure-table He=helium_visc.csv --out ar-he-joint
"""
EPILOG_DEMO = """examples:
  fitkin demo                       (writes ./fitkin-demo/)
  fitkin demo --out /tmp/demo --force
"""
EPILOG_INVERT = """examples:
  fitkin invert argon_visc.csv argon_virial.csv --formula Ar --out inv-argon
  fitkin invert visc.csv --formula Ar --start lj --iterations 5 --perturbed 0 --out inv --force
  fitkin invert visc.csv --formula Kr --free-well --out inv-free   (no B(T); well depth not held)
  fitkin fit visc.csv --formula Ar --potential inv-argon/potential.csv --out fit-tab   (reuse the curve)
"""
