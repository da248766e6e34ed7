package org.switchfit.fit;

import java.util.SplittableRandom;

/**
 * Independent, reproducible random streams derived from (seed, index): the stream of task {@code index} does not
 * depend on how many tasks exist, which thread runs it, or in which order tasks run. The stream seed is the
 * SplitMix64 finaliser (Steele, Lea and Flood 2014, "Fast splittable pseudorandom number generators", OOPSLA,
 * doi:10.1145/2660193.2660195) applied twice to combine seed and index.
 */
public final class RandomStreams {

    private RandomStreams() {
    }

    /** The stream for task {@code index} of the run with {@code seed}. */
    public static SplittableRandom stream(long seed, long index) {
        return new SplittableRandom(mix(mix(seed) ^ (index * 0x9E3779B97F4A7C15L + 0x632BE59BD9B4E019L)));
    }

    static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
