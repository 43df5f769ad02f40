#!/usr/bin/env python3
"""A general-purpose NSGA-II (DEAP) driving `coilfront evaluate --batch -` through one open pipe.

Not part of the test suite and not needed to build or use coilfront: it is the outside reference for
the evolve stage's benchmark (bench/external/nsga2-compare.ts), run by hand where DEAP is installed
(Debian: `apt-get install python3-deap`). Population 100; simulated binary crossover and polynomial
mutation (Deb & Agrawal 1995; Deb & Goyal 1996) as DEAP ships them, eta 20, crossover 0.9,
mutation 1/d per gene; Deb's constraint rules by fitness: an infeasible design is dominated by every
feasible one, and among infeasible designs the smaller total violation dominates.

usage: nsga2_deap.py SPEC.yaml BUDGET SEED CLI_JS OUT.json
Prints nothing; writes every feasible design's objective values (SI) to OUT.json.
"""
import json
import random
import subprocess
import sys

import yaml
from deap import base, creator, tools

spec_path, budget, seed, cli_js, out_path = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), sys.argv[4], sys.argv[5]
spec = yaml.safe_load(open(spec_path))
random.seed(seed)

# The varied leaves of the design tree, in a fixed order.
dims = []


def walk(node, path):
    for key, value in node.items():
        here = path + [key]
        if isinstance(value, dict) and ("from" in value or "choose" in value):
            dims.append((here, value))
        elif isinstance(value, dict):
            walk(value, here)


walk(spec["design"], [])

UNITS = {"mm": 1e-3, "m": 1.0, "kHz": 1e3, "Hz": 1.0, "kV": 1e3, "V": 1.0, "kg": 1.0, "nF": 1e-9, "pF": 1e-12}


def si(text):
    if isinstance(text, (int, float)):
        return float(text)
    number, unit = str(text).split()
    return float(number) * UNITS[unit]


def decode(genes):
    design = json.loads(json.dumps(spec["design"]))
    for (path, dim), u in zip(dims, genes):
        if "choose" in dim:
            levels = dim["choose"]
            value = levels[min(len(levels) - 1, int(u * len(levels)))]
        else:
            low, high = dim["from"], dim["to"]
            if dim.get("integer"):
                value = int(round(low + u * (high - low)))
            else:
                unit = str(low).split()[1]
                lo, hi = float(str(low).split()[0]), float(str(high).split()[0])
                value = f"{lo + u * (hi - lo)!r} {unit}"
        node = design
        for key in path[:-1]:
            node = node[key]
        node[path[-1]] = value
    return design


objectives = [(next(iter(o.values())), 1.0 if "maximize" in o else -1.0) for o in spec["objectives"]]
constraints = [(metric, si(b["min"]) if "min" in b else None, si(b["max"]) if "max" in b else None)
               for metric, b in spec.get("constraints", {}).items()]

creator.create("Fitness", base.Fitness, weights=tuple(w for _, w in objectives))
creator.create("Individual", list, fitness=creator.Fitness)

cli = subprocess.Popen(["node", cli_js, "evaluate", "--batch", "-", "--workers", "2"],
                       stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True, bufsize=1)
feasible_points = []
INFEASIBLE = 1e12


def evaluate_all(individuals):
    """One generation through the open pipe: write its lines, read as many answers."""
    for ind in individuals:
        cli.stdin.write(json.dumps(decode(ind)) + "\n")
    cli.stdin.flush()
    for ind in individuals:
        answer = json.loads(cli.stdout.readline())
        metrics = answer.get("metrics")
        violation = 1.0 if metrics is None else 0.0
        if metrics is not None:
            for metric, low, high in constraints:
                v = metrics.get(metric)
                if v is None:
                    violation += 1.0
                    continue
                if low is not None and v < low:
                    violation += (low - v) / abs(low)
                if high is not None and v > high:
                    violation += (v - high) / abs(high)
            if any(metrics.get(m) is None for m, _ in objectives):
                violation += 1.0
        if violation == 0:
            values = tuple(metrics[m] for m, _ in objectives)
            feasible_points.append(values)
            ind.fitness.values = values
        else:
            # worse than any feasible design in every objective, ordered by violation
            ind.fitness.values = tuple(-w * INFEASIBLE * (1 + violation) for _, w in objectives)


toolbox = base.Toolbox()
d = len(dims)
toolbox.register("individual", tools.initIterate, creator.Individual, lambda: [random.random() for _ in range(d)])
toolbox.register("population", tools.initRepeat, list, toolbox.individual)
toolbox.register("mate", tools.cxSimulatedBinaryBounded, eta=20.0, low=0.0, up=1.0)
toolbox.register("mutate", tools.mutPolynomialBounded, eta=20.0, low=0.0, up=1.0, indpb=1.0 / d)
toolbox.register("select", tools.selNSGA2)

POP = 100
population = toolbox.population(n=POP)
evaluate_all(population)
used = POP
population = toolbox.select(population, POP)
while used + POP <= budget:
    offspring = [toolbox.clone(i) for i in tools.selTournamentDCD(population, POP)]
    for a, b in zip(offspring[::2], offspring[1::2]):
        if random.random() <= 0.9:
            toolbox.mate(a, b)
        toolbox.mutate(a)
        toolbox.mutate(b)
        del a.fitness.values, b.fitness.values
    evaluate_all(offspring)
    used += POP
    population = toolbox.select(population + offspring, POP)

cli.stdin.close()
cli.wait()
json.dump({"evaluations": used, "objectives": [m for m, _ in objectives], "points": feasible_points}, open(out_path, "w"))
