#!/usr/bin/env python3
"""The Python side of the call overhead: times tauforge.synthesize on the inputs of
bench/python_call_bench.cpp with timeit and prints microseconds per call.

    PYTHONPATH=build/bench-py/python python3 bench/python_overhead.py
"""
import time
import timeit

import tauforge as tf

r = tf.ResistorValues.from_series("E24", 1e3, 1e6)
c = tf.CapacitorValues.from_series("E12", 1e-9, 1e-6)
net = tf.RcDelay()
spec = {"delay": "1ms,20%"}


def call():
    return tf.synthesize(net, spec, resistors=r, capacitors=c, top=3)


assert [d["parts"]["R"]["value"] for d in call()["designs"]] == [1100.0, 11000.0, 110000.0]
number, _ = timeit.Timer(call).autorange()
# CPU time, as Google Benchmark's cpu_time column, and wall time; best of 5 repeats.
for name, clock in (("cpu", time.process_time), ("wall", time.perf_counter)):
    best = min(timeit.Timer(call, timer=clock).repeat(repeat=5, number=number)) / number
    print(f"python synthesize ({name}): {best * 1e6:.1f} us per call (best of 5 x {number})")
