#!/usr/bin/python3
"""Makes the float64 replay fixture for settle's mini-batch SGD (ReplayAgainstTorchTest).

Reference library: Debian's python3-torch 1.13.1+dfsg-4 (torch.__version__ reports 1.13.0a0), numpy 1.24.2.
Run from this directory with:  OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py

For two small invented datasets (binary: 40 rows x 3 features; multinomial: 45 rows x 3 features, 3 classes)
it writes the data (<data>.csv, header x1,x2,x3,y), one sample order per epoch (<data>-order.txt, the format of
`settle trace --order`: one line per epoch, 0-based row indices, comma-separated), a start
(<data>-start.txt, one value per line, settle's parameter order) and, for every case, <case>.txt with lines
    rate <update> <rate>          the rate of every update
    epoch <e> <objective>         the full-batch objective after epoch e
    final <i> <value>             the final parameters, settle's order
Everything is float64 (torch.set_default_dtype(torch.float64)). The model is torch.nn.Linear; the loss is
mean cross-entropy (binary_cross_entropy_with_logits / cross_entropy) + (lambda/2)*||weight||^2 written into
the loss, so the bias is not penalised. The optimiser is torch.optim.SGD(momentum=beta, dampening=0,
nesterov=False, weight_decay=0), whose update is v <- beta*v + g, theta <- theta - lr*v (v0 = g on the first
update, which equals beta*0 + g), the rate set in param_groups before every update.

Rates: settle counts epochs and updates from 1. constant: 0.1; epoch decay: 0.2/(1 + 0.5*epoch), epoch = 1 for
the first pass; update decay: 0.2/(1 + 0.05*update), update = 1 for the first update. Batch 8, shuffle orders:
binary 40 rows -> 5 updates per epoch; multinomial 45 rows -> 6 updates, the last of 5 rows. Six epochs.
"""
import numpy as np
import torch

torch.set_default_dtype(torch.float64)
torch.set_num_threads(1)

EPOCHS = 6
BATCH = 8
L2 = 0.01


def make_data(rng, n, d, k):
    centres = rng.normal(scale=1.5, size=(k, d))
    y = np.arange(n) % k
    rng.shuffle(y)
    x = centres[y] + rng.normal(size=(n, d))
    return x, y


def write_data(name, x, y):
    with open(name + ".csv", "w") as f:
        f.write(",".join("x%d" % (j + 1) for j in range(x.shape[1])) + ",y\n")
        for row, label in zip(x, y):
            f.write(",".join(repr(float(v)) for v in row) + ",%d\n" % label)


def rate(kind, epoch, update):
    if kind == "constant":
        return 0.1
    if kind == "epoch-decay":
        return 0.2 / (1 + 0.5 * epoch)
    if kind == "update-decay":
        return 0.2 / (1 + 0.05 * update)
    raise ValueError(kind)


def objective(linear, x, y, k):
    z = linear(x)
    if k == 2:
        loss = torch.nn.functional.binary_cross_entropy_with_logits(z[:, 0], y.double())
    else:
        loss = torch.nn.functional.cross_entropy(z, y)
    return loss + 0.5 * L2 * (linear.weight ** 2).sum()


def flat(linear):
    # settle's order: the weights (class 0's d, class 1's, ...) then the biases
    return np.concatenate([linear.weight.detach().numpy().ravel(), linear.bias.detach().numpy().ravel()])


def run(name, x, y, k, start, orders, kind, momentum):
    d = x.shape[1]
    outputs = 1 if k == 2 else k
    linear = torch.nn.Linear(d, outputs)
    with torch.no_grad():
        linear.weight.copy_(torch.tensor(start[: outputs * d].reshape(outputs, d)))
        linear.bias.copy_(torch.tensor(start[outputs * d:]))
    xt = torch.tensor(x)
    yt = torch.tensor(y, dtype=torch.long)
    opt = torch.optim.SGD(linear.parameters(), lr=0.1, momentum=momentum, dampening=0, nesterov=False,
                          weight_decay=0)
    lines = []
    update = 0
    for epoch in range(1, EPOCHS + 1):
        order = orders[epoch - 1]
        for first in range(0, len(order), BATCH):
            update += 1
            idx = torch.tensor(order[first:first + BATCH], dtype=torch.long)
            alpha = rate(kind, epoch, update)
            for group in opt.param_groups:
                group["lr"] = alpha
            opt.zero_grad()
            objective(linear, xt[idx], yt[idx], k).backward()
            opt.step()
            lines.append("rate %d %r" % (update, alpha))
        with torch.no_grad():
            lines.append("epoch %d %r" % (epoch, float(objective(linear, xt, yt, k))))
    for i, v in enumerate(flat(linear)):
        lines.append("final %d %r" % (i, float(v)))
    case = "%s-%s-momentum%s" % (name, kind, "0" if momentum == 0 else str(momentum))
    with open(case + ".txt", "w") as f:
        f.write("# made by make_fixture.py with torch %s (Debian python3-torch 1.13.1)\n" % torch.__version__)
        f.write("\n".join(lines) + "\n")


def main():
    rng = np.random.default_rng(20260407)
    for name, n, k in (("binary", 40, 2), ("multinomial", 45, 3)):
        x, y = make_data(rng, n, 3, k)
        write_data(name, x, y)
        orders = [rng.permutation(n).tolist() for _ in range(EPOCHS)]
        with open(name + "-order.txt", "w") as f:
            for order in orders:
                f.write(",".join(str(i) for i in order) + "\n")
        p = (1 if k == 2 else k) * 3 + (1 if k == 2 else k)
        start = rng.normal(scale=0.3, size=p)
        with open(name + "-start.txt", "w") as f:
            f.write("\n".join(repr(float(v)) for v in start) + "\n")
        for kind in ("constant", "epoch-decay", "update-decay"):
            for momentum in (0.0, 0.9):
                run(name, x, y, k, start, orders, kind, momentum)


if __name__ == "__main__":
    main()
