#!/usr/bin/python3
"""The peer side of settle's speed comparison: the same workloads in PyTorch (Debian's python3-torch 1.13.1),
float64, one thread, in two variants:

  idiomatic  torch.nn modules, autograd, torch.optim.SGD, torch.optim.lr_scheduler.LambdaLR, nn.CrossEntropyLoss
  hand       hand-written tensor math under torch.no_grad(): forward, softmax, deltas, weight gradients and the
             update with addmm/in-place ops, no autograd

Both shuffle every epoch (torch.randperm), train ceil(N/B) updates per epoch at the rate rate/(1 + 0.5 e) in
epoch e = 1, 2, ..., lambda = 0, and evaluate the full-batch training objective at the start and after every
epoch, as settle's trainer does. Only the training loop is timed (data already in memory as tensors), by the wall
clock and by this process's CPU time (time.process_time, which a shared machine's other load does not inflate).

Protocol (one line per command on stdin, one line of reply on stdout):
  load KEY DIR D HIDDEN K B N EPOCHS RATE   (HIDDEN: comma-separated sizes or '-'; DIR holds KEY.x and KEY.y)
  run KEY VARIANT SEED [COUNT]              -> "ok WALL_SECONDS CPU_SECONDS FINAL_OBJECTIVE"
                                               (COUNT replicates back to back, seeds SEED, SEED + 1, ...: the
                                               seconds are their sum, the objective the last one's)
  quit
The caller sets OMP_NUM_THREADS=1 OPENBLAS_NUM_THREADS=1 MKL_NUM_THREADS=1 in this process's environment.
"""
import os
import sys
import time

import numpy as np
import torch

torch.set_num_threads(1)
torch.set_default_dtype(torch.float64)

workloads = {}


def load(key, directory, d, hidden, k, b, n, epochs, rate):
    x = np.fromfile(os.path.join(directory, key + ".x"), dtype="<f8").reshape(n, d)
    y = np.fromfile(os.path.join(directory, key + ".y"), dtype="<i4").astype(np.int64)
    sizes = [d] + hidden + [k]
    workloads[key] = dict(x=torch.from_numpy(x.copy()), y=torch.from_numpy(y), sizes=sizes, batch=b, rows=n,
                          epochs=epochs, rate=rate)


def rate_at(w, epoch):
    return w["rate"] / (1.0 + 0.5 * epoch)


def idiomatic(w, seed):
    torch.manual_seed(seed)
    sizes = w["sizes"]
    layers = []
    for i in range(len(sizes) - 1):
        layers.append(torch.nn.Linear(sizes[i], sizes[i + 1]))
        if i < len(sizes) - 2:
            layers.append(torch.nn.ReLU())
    model = torch.nn.Sequential(*layers).double()
    loss_fn = torch.nn.CrossEntropyLoss()
    opt = torch.optim.SGD(model.parameters(), lr=w["rate"])
    # LambdaLR's counter starts at 0 for epoch 1: factor 1/(1 + 0.5 (e0 + 1))
    sched = torch.optim.lr_scheduler.LambdaLR(opt, lambda e0: 1.0 / (1.0 + 0.5 * (e0 + 1)))
    x, y, b, n = w["x"], w["y"], w["batch"], w["rows"]
    generator = torch.Generator().manual_seed(seed)
    start = time.perf_counter()
    cpu = time.process_time()
    with torch.no_grad():
        objective = loss_fn(model(x), y).item()
    for epoch in range(1, w["epochs"] + 1):
        perm = torch.randperm(n, generator=generator)
        for first in range(0, n, b):
            idx = perm[first:first + b]
            opt.zero_grad()
            loss = loss_fn(model(x[idx]), y[idx])
            loss.backward()
            opt.step()
        sched.step()
        with torch.no_grad():
            objective = loss_fn(model(x), y).item()
    return time.perf_counter() - start, time.process_time() - cpu, objective


def hand(w, seed):
    torch.manual_seed(seed)
    sizes = w["sizes"]
    weights, biases = [], []
    for i in range(len(sizes) - 1):
        bound = 1.0 / sizes[i] ** 0.5
        weights.append(torch.empty(sizes[i + 1], sizes[i]).uniform_(-bound, bound))
        biases.append(torch.zeros(sizes[i + 1]))
    x, y, b, n = w["x"], w["y"], w["batch"], w["rows"]
    layers = len(weights)
    generator = torch.Generator().manual_seed(seed)

    def objective_of():
        a = x
        for l in range(layers):
            z = torch.addmm(biases[l], a, weights[l].t())
            a = z.clamp_min_(0.0) if l < layers - 1 else z
        return (torch.logsumexp(a, 1) - a.gather(1, y.unsqueeze(1)).squeeze(1)).mean().item()

    start = time.perf_counter()
    cpu = time.process_time()
    with torch.no_grad():
        objective = objective_of()
        for epoch in range(1, w["epochs"] + 1):
            rate = rate_at(w, epoch)
            perm = torch.randperm(n, generator=generator)
            for first in range(0, n, b):
                idx = perm[first:first + b]
                xb, yb = x[idx], y[idx]
                rows = xb.shape[0]
                acts = [xb]
                a = xb
                for l in range(layers):
                    z = torch.addmm(biases[l], a, weights[l].t())
                    a = z.clamp_min_(0.0) if l < layers - 1 else z
                    acts.append(a)
                delta = torch.softmax(acts[-1], 1)
                delta[torch.arange(rows), yb] -= 1.0
                delta.div_(rows)
                for l in range(layers - 1, -1, -1):
                    grad_w = delta.t().mm(acts[l])
                    grad_b = delta.sum(0)
                    if l > 0:
                        delta = delta.mm(weights[l]).mul_(acts[l] > 0)
                    weights[l].add_(grad_w, alpha=-rate)
                    biases[l].add_(grad_b, alpha=-rate)
            objective = objective_of()
    return time.perf_counter() - start, time.process_time() - cpu, objective


def blas_loaded():
    """The BLAS libraries mapped into this process (after a product has run), by file name."""
    torch.ones(8, 8, dtype=torch.float64).mm(torch.ones(8, 8, dtype=torch.float64))
    names = set()
    with open("/proc/self/maps") as maps:
        for line in maps:
            path = line.split()[-1]
            if "blas" in path or "mkl" in path:
                names.add(os.path.realpath(path))
    return ",".join(sorted(names)) or "none-found"


def main():
    for line in sys.stdin:
        parts = line.split()
        if not parts:
            continue
        if parts[0] == "quit":
            break
        try:
            if parts[0] == "load":
                key, directory = parts[1], parts[2]
                d, k, b, n, epochs = int(parts[3]), int(parts[5]), int(parts[6]), int(parts[7]), int(parts[8])
                hidden = [] if parts[4] == "-" else [int(s) for s in parts[4].split(",")]
                load(key, directory, d, hidden, k, b, n, epochs, float(parts[9]))
                print("ok", flush=True)
            elif parts[0] == "run":
                w = workloads[parts[1]]
                variant = {"idiomatic": idiomatic, "hand": hand}[parts[2]]
                seconds = cpu = 0.0
                for seed in range(int(parts[3]), int(parts[3]) + (int(parts[4]) if len(parts) > 4 else 1)):
                    wall, used, objective = variant(w, seed)
                    seconds += wall
                    cpu += used
                print("ok %.9f %.9f %.17g" % (seconds, cpu, objective), flush=True)
            elif parts[0] == "version":
                print("ok torch %s numpy %s threads %d blas %s" % (torch.__version__, np.__version__,
                                                                   torch.get_num_threads(), blas_loaded()), flush=True)
            else:
                print("error unknown command " + parts[0], flush=True)
        except Exception as e:  # report and carry on: the caller prints the message
            print("error %s: %s" % (type(e).__name__, str(e).replace("\n", " ")), flush=True)


if __name__ == "__main__":
    main()
