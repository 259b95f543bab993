#!/usr/bin/python3
"""Reference learning rates from a general-purpose library's own schedulers, for ScheduleTorchFixtureTest.

Library: Debian's python3-torch 1.13.1 (torch.optim.lr_scheduler), float64 Python floats.
Run:     OMP_NUM_THREADS=1 /usr/bin/python3 make_torch_fixture.py > torch_schedules.csv

Output columns: case, index, rate. `index` is the library's own 0-based counter: the epoch index i (its
scheduler stepped once per epoch), or for the per-update case the update index j (stepped with the
fractional epoch j / updates_per_epoch). The mapping onto settle's counters (epoch e = 1, 2, ...;
update u = 1, 2, ...) is written beside each check in the Java test.
"""
import torch
from torch.optim import SGD
from torch.optim import lr_scheduler as ls

# Debian packages 1.13.1 (dpkg: python3-torch 1.13.1+dfsg); torch.__version__ reports "1.13.0a0".
assert torch.__version__.startswith("1.13"), torch.__version__


def optimiser(lr):
    p = torch.nn.Parameter(torch.zeros(1, dtype=torch.float64))
    return SGD([p], lr=lr)


def per_epoch(case, lr, make, epochs):
    opt = optimiser(lr)
    sched = make(opt)
    for i in range(epochs):
        print(f"{case},{i},{opt.param_groups[0]['lr']!r}")
        opt.step()
        sched.step()


print("case,index,rate")
per_epoch("step", 0.2, lambda o: ls.StepLR(o, step_size=3, gamma=0.5), 10)
per_epoch("multistep", 0.1, lambda o: ls.MultiStepLR(o, milestones=[2, 5, 6], gamma=0.1), 8)
per_epoch("exponential", 0.1, lambda o: ls.ExponentialLR(o, gamma=0.9), 11)
per_epoch("cosine", 0.1, lambda o: ls.CosineAnnealingLR(o, T_max=10, eta_min=0.01), 10)
per_epoch("restarts", 0.1, lambda o: ls.CosineAnnealingWarmRestarts(o, T_0=3, T_mult=2, eta_min=0.001), 21)
per_epoch("linear", 0.1, lambda o: ls.LinearLR(o, start_factor=1.0, end_factor=0.1, total_iters=10), 10)
per_epoch("polynomial", 0.1, lambda o: ls.PolynomialLR(o, total_iters=8, power=2.0), 8)

# Warm restarts stepped within epochs: 4 updates per epoch, 9 epochs (cycles of 2 and 4 epochs, then a third).
opt = optimiser(0.05)
sched = ls.CosineAnnealingWarmRestarts(opt, T_0=2, T_mult=2, eta_min=0.0)
for j in range(9 * 4):
    opt.step()
    sched.step(j / 4)
    print(f"restarts-per-update,{j},{opt.param_groups[0]['lr']!r}")
