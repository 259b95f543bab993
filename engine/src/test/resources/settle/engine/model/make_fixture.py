#!/usr/bin/python3
"""Reference batch objectives and gradients for settle's models, computed by PyTorch autograd in float64.

Library: Debian's python3-torch 1.13.1+dfsg-4 (torch.__version__ reports "1.13.0a0"), numpy 1.24.2.
Run:     OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py > model_gradients.txt

For each case: a batch x (n x d, standard normal), labels y, parameters theta (normal, scale 0.7) in settle's
order (DESIGN.md "Training semantics": per layer, the weights out x in row-major as torch.nn.Linear stores
them, then the biases; binary logistic: the d weights then the bias), and the objective
    F = mean cross-entropy + (l2/2) * sum of squared weights (biases unpenalised)
with its gradient from autograd. Binary logistic uses binary_cross_entropy_with_logits on one output unit
(class 1 positive); every other model uses cross_entropy (log-softmax) over K outputs, including the MLP with
K = 2 (a 2-way softmax).

Output, one line per item, whitespace-separated:
    case NAME KIND ACTIVATION L2 N D K HIDDEN(comma-separated or -)
    x v...      (n*d values, row-major)
    y v...      (n labels)
    theta v...
    objective v
    gradient v...
    probabilities v...   (n*K, row-major; binary: 1-p, p)
"""
import numpy as np
import torch
import torch.nn.functional as F

torch.set_default_dtype(torch.float64)
rng = np.random.default_rng(20260)


def layer_sizes(kind, d, k, hidden):
    if kind == "binary":
        return [d, 1]
    if kind == "softmax":
        return [d, k]
    return [d] + hidden + [k]


def case(name, kind, activation, l2, n, d, k, hidden):
    sizes = layer_sizes(kind, d, k, hidden)
    x = rng.standard_normal((n, d))
    y = np.concatenate([np.arange(min(n, k)), rng.integers(0, k, max(0, n - k))])
    count = sum(sizes[i + 1] * sizes[i] + sizes[i + 1] for i in range(len(sizes) - 1))
    theta = 0.7 * rng.standard_normal(count)
    t = torch.tensor(theta, requires_grad=True)
    xt = torch.tensor(x)
    a = xt
    offset = 0
    penalty = torch.zeros(())
    nearest_kink = float("inf")
    for l in range(len(sizes) - 1):
        nin, nout = sizes[l], sizes[l + 1]
        w = t[offset:offset + nout * nin].reshape(nout, nin)
        offset += nout * nin
        b = t[offset:offset + nout]
        offset += nout
        penalty = penalty + (w * w).sum()
        a = F.linear(a, w, b)
        if l < len(sizes) - 2:
            nearest_kink = min(nearest_kink, float(a.detach().abs().min()))
            a = torch.relu(a) if activation == "relu" else torch.tanh(a)
    if kind == "binary":
        z = a[:, 0]
        loss = F.binary_cross_entropy_with_logits(z, torch.tensor(y, dtype=torch.float64), reduction="mean")
        p1 = torch.sigmoid(z)
        probs = torch.stack([1 - p1, p1], dim=1)
    else:
        loss = F.cross_entropy(a, torch.tensor(y, dtype=torch.long), reduction="mean")
        probs = torch.softmax(a, dim=1)
    objective = loss + 0.5 * l2 * penalty
    objective.backward()
    # ReLU has no derivative at 0: every hidden pre-activation of these draws is checked to be far from it
    assert activation != "relu" or nearest_kink > 1e-3, (name, nearest_kink)
    fmt = lambda v: " ".join(repr(float(u)) for u in np.ravel(v))
    print("case", name, kind, activation, repr(l2), n, d, k, ",".join(map(str, hidden)) or "-")
    print("x", fmt(x))
    print("y", " ".join(str(int(u)) for u in y))
    print("theta", fmt(theta))
    print("objective", repr(float(objective.item())))
    print("gradient", fmt(t.grad.numpy()))
    print("probabilities", fmt(probs.detach().numpy()))


case("binary", "binary", "-", 0.05, 6, 4, 2, [])
case("softmax", "softmax", "-", 0.05, 7, 4, 3, [])
case("mlp-relu", "mlp", "relu", 0.01, 8, 4, 3, [6, 5])
case("mlp-tanh", "mlp", "tanh", 0.0, 5, 3, 2, [4])
case("mlp-relu-one", "mlp", "relu", 0.1, 1, 5, 4, [7])
