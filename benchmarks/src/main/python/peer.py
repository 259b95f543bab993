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
  study KEY DIR D HIDDEN K B EPOCHS ARMS L2 AVERAGED
                                            a study of ARMS arms (AVERAGED: comma-separated 0/1 per arm, 1 for an
                                            arm whose final iterate is the tail average); DIR holds KEY.train.x/.y,
                                            KEY.test.x/.y (float64 / int32), KEY.rates (ARMS x T float64: each
                                            arm's rate at each update) and KEY.tail (int32: the tail's first
                                            update, then the snapshot updates)
  trainstudy KEY SEED COUNT                 -> "ok WALL CPU ARMS UPDATES EVALUATIONS F_1,...,F_ARMS": COUNT
                                               replicates of every arm, batched (see study_replicate); the work
                                               counted over all of them, F_a arm a's mean final objective
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


studies = {}


def load_study(key, directory, d, hidden, k, b, epochs, arms, l2, averaged):
    def doubles(name, shape):
        return torch.from_numpy(np.fromfile(os.path.join(directory, key + name), dtype="<f8").reshape(shape).copy())

    def ints(name):
        return torch.from_numpy(np.fromfile(os.path.join(directory, key + name), dtype="<i4").astype(np.int64))

    train_y, test_y = ints(".train.y"), ints(".test.y")
    rates = np.fromfile(os.path.join(directory, key + ".rates"), dtype="<f8").reshape(arms, -1)
    tail = np.fromfile(os.path.join(directory, key + ".tail"), dtype="<i4")
    studies[key] = dict(x=doubles(".train.x", (len(train_y), d)), y=train_y, test_x=doubles(".test.x", (len(test_y), d)),
                        test_y=test_y, sizes=[d] + hidden + [k], batch=b, epochs=epochs, arms=arms, l2=l2,
                        averaged=torch.tensor(averaged, dtype=torch.bool),
                        rates=[torch.from_numpy(rates[:, t].copy()).view(arms, 1, 1) for t in range(rates.shape[1])],
                        tail_first=int(tail[0]), snapshots=set(int(u) for u in tail[1:]), last_snapshot=int(tail[-1]))


def stacked_forward(weights, biases, x, keep=None):
    """Every stacked parameter vector's forward pass on one shared batch x (n x d): the first layer as one product
    of x with all S vectors' weights side by side, later layers as batched products (torch.baddbmm); ReLU between
    layers. Returns the logits (S x n x K) and, when keep is a list, appends each layer's input to it."""
    s, n = weights[0].shape[0], x.shape[0]
    out = weights[0].shape[1]
    a = torch.mm(x, weights[0].reshape(s * out, -1).t()).view(n, s, out).transpose(0, 1) + biases[0].unsqueeze(1)
    if keep is not None:
        keep.append(x)
    for l in range(1, len(weights)):
        a = a.clamp_min_(0.0)
        if keep is not None:
            keep.append(a)
        a = torch.baddbmm(biases[l].unsqueeze(1), a, weights[l].transpose(1, 2))
    return a


def stacked_loss_sums(weights, biases, x, y, chunk=2048):
    """Sum over the rows of x of each stacked vector's cross-entropy (a tensor of S sums), chunk by chunk."""
    total = torch.zeros(weights[0].shape[0])
    for first in range(0, x.shape[0], chunk):
        z = stacked_forward(weights, biases, x[first:first + chunk])
        yy = y[first:first + chunk]
        total += (torch.logsumexp(z, 2) - z.gather(2, yy.view(1, -1, 1).expand(z.shape[0], -1, 1)).squeeze(2)).sum(1)
    return total


def stacked_penalty(weights, l2):
    return 0.5 * l2 * sum((w * w).sum((1, 2)) for w in weights)


def study_replicate(st, seed, work):
    """One replicate of every arm, trained batched: the arms' weights stacked (arm first), each mini-batch's forward
    and gradient products computed for all arms at once, each arm's own rate at each update. The same work as
    settle's trainer per arm: ceil(N/B) updates per epoch (shuffled, every arm the same order: seed pairing), the
    batch objective at every update, lambda/2 ||weights||^2 on the weights (biases unpenalised); F on the training
    split at the start and after every epoch, the test loss and accuracy after every epoch; over the tail the
    running sum of the iterates and a copy at each snapshot update; after training F at every snapshot but the last
    (the last epoch end's), F at the tail average, and the test loss, accuracy and class probabilities at the final
    iterate (the tail average for averaged arms). Returns each arm's F after the last epoch."""
    torch.manual_seed(seed)
    sizes, arms, l2 = st["sizes"], st["arms"], st["l2"]
    layers = len(sizes) - 1
    weights, biases = [], []
    for l in range(layers):
        if layers == 1:
            weights.append(torch.zeros(arms, sizes[l + 1], sizes[l]))  # convex model: zeros, as settle starts it
        else:
            weights.append(torch.randn(arms, sizes[l + 1], sizes[l]) * (2.0 / sizes[l]) ** 0.5)  # He
        biases.append(torch.zeros(arms, sizes[l + 1]))
    x, y, test_x, test_y, b = st["x"], st["y"], st["test_x"], st["test_y"], st["batch"]
    n = x.shape[0]
    generator = torch.Generator().manual_seed(seed)
    rows_all = torch.arange(b)
    tail_w = [torch.zeros_like(w) for w in weights]
    tail_b = [torch.zeros_like(v) for v in biases]
    tail_count = 0
    snap_w, snap_b = [], []

    def evaluate(ws, bs):
        work["evaluations"] += ws[0].shape[0]
        return stacked_loss_sums(ws, bs, x, y) / n + stacked_penalty(ws, l2)

    def test_metrics(ws, bs):
        z = stacked_forward(ws, bs, test_x)
        loss = (torch.logsumexp(z, 2) - z.gather(2, test_y.view(1, -1, 1).expand(z.shape[0], -1, 1)).squeeze(2)).mean(1)
        accuracy = (z.argmax(2) == test_y).double().mean(1)
        return loss, accuracy, z

    objective = evaluate(weights, biases)
    t = 0
    with torch.no_grad():
        for epoch in range(1, st["epochs"] + 1):
            perm = torch.randperm(n, generator=generator)
            for first in range(0, n, b):
                t += 1
                idx = perm[first:first + b]
                xb, yb = x[idx], y[idx]
                rows = xb.shape[0]
                inputs = []
                z = stacked_forward(weights, biases, xb, inputs)
                batch_loss = (torch.logsumexp(z, 2) - z.gather(2, yb.view(1, -1, 1).expand(arms, -1, 1)).squeeze(2)).mean(1)
                batch_loss += stacked_penalty(weights, l2)
                delta = torch.softmax(z, 2)
                delta[:, rows_all[:rows], yb] -= 1.0
                delta.div_(rows)
                rate = st["rates"][t - 1]
                for l in range(layers - 1, -1, -1):
                    if l == 0:
                        out = delta.shape[2]
                        grad_w = torch.mm(delta.transpose(0, 1).reshape(rows, arms * out).t(), inputs[0]).view(arms, out, -1)
                    else:
                        grad_w = torch.bmm(delta.transpose(1, 2), inputs[l])
                    grad_b = delta.sum(1)
                    if l > 0:
                        delta = torch.bmm(delta, weights[l]).mul_(inputs[l] > 0)
                    grad_w.add_(weights[l], alpha=l2)
                    weights[l].sub_(grad_w.mul_(rate))
                    biases[l].sub_(grad_b.mul_(rate.view(arms, 1)))
                work["updates"] += arms
                if t >= st["tail_first"]:
                    for l in range(layers):
                        tail_w[l].add_(weights[l])
                        tail_b[l].add_(biases[l])
                    tail_count += 1
                    if t in st["snapshots"] and t != st["last_snapshot"]:
                        snap_w.append([w.clone() for w in weights])
                        snap_b.append([v.clone() for v in biases])
            objective = evaluate(weights, biases)
            test_metrics(weights, biases)
        # F at every snapshot but the last, all arms' snapshots stacked into one evaluation
        count = len(snap_w)
        if count:
            evaluate([torch.cat([s[l] for s in snap_w]) for l in range(layers)],
                     [torch.cat([s[l] for s in snap_b]) for l in range(layers)])
        mean_w = [w / tail_count for w in tail_w]
        mean_b = [v / tail_count for v in tail_b]
        evaluate(mean_w, mean_b)
        avg = st["averaged"]
        final_w = [torch.where(avg.view(-1, 1, 1), mean_w[l], weights[l]) for l in range(layers)]
        final_b = [torch.where(avg.view(-1, 1), mean_b[l], biases[l]) for l in range(layers)]
        _, _, z = test_metrics(final_w, final_b)
        torch.softmax(z, 2)
    return objective


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
            elif parts[0] == "study":
                key, directory = parts[1], parts[2]
                hidden = [] if parts[4] == "-" else [int(s) for s in parts[4].split(",")]
                load_study(key, directory, int(parts[3]), hidden, int(parts[5]), int(parts[6]), int(parts[7]),
                           int(parts[8]), float(parts[9]), [p == "1" for p in parts[10].split(",")])
                print("ok", flush=True)
            elif parts[0] == "trainstudy":
                st = studies[parts[1]]
                first, count = int(parts[2]), int(parts[3])
                work = dict(updates=0, evaluations=0)
                final = torch.zeros(st["arms"])
                start = time.perf_counter()
                cpu = time.process_time()
                for seed in range(first, first + count):
                    final += study_replicate(st, seed, work)
                wall, used = time.perf_counter() - start, time.process_time() - cpu
                print("ok %.9f %.9f %d %d %d %s" % (wall, used, st["arms"], work["updates"], work["evaluations"],
                                                   ",".join("%.17g" % v for v in (final / count).tolist())), flush=True)
            elif parts[0] == "version":
                print("ok torch %s numpy %s threads %d blas %s" % (torch.__version__, np.__version__,
                                                                   torch.get_num_threads(), blas_loaded()), flush=True)
            else:
                print("error unknown command " + parts[0], flush=True)
        except Exception as e:  # report and carry on: the caller prints the message
            print("error %s: %s" % (type(e).__name__, str(e).replace("\n", " ")), flush=True)


if __name__ == "__main__":
    main()
