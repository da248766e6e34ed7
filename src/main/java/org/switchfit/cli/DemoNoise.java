package org.switchfit.cli;

import java.nio.charset.StandardCharsets;

/**
 * Seeded standard-normal numbers for the synthetic demo data, specified completely so that the data can be
 * regenerated bit for bit on any JVM: SplitMix64 (Steele, Lea and Flood 2014, "Fast splittable pseudorandom
 * number generators", OOPSLA, doi:10.1145/2660193.2660195) for 64-bit words, 53-bit uniforms in (0, 1), and the
 * Box-Muller transform (Box and Muller 1958, Ann. Math. Statist. 29:610-611) with {@link StrictMath}. One stream
 * per (seed, key), the key naming the data block (e.g. {@code timecourse/step_3/act_frac}), so adding a block
 * leaves the others unchanged. Not thread-safe (one instance per stream).
 */
final class DemoNoise {
    private long state;
    private double spare = Double.NaN;

    /** A stream for (seed, key): the state starts at seed XOR the 64-bit FNV-1a hash of the key's UTF-8 bytes. */
    DemoNoise(long seed, String key) {
        long h = 0xcbf29ce484222325L;
        for (byte b : key.getBytes(StandardCharsets.UTF_8)) {
            h ^= b & 0xff;
            h *= 0x100000001b3L;
        }
        this.state = seed ^ h;
    }

    /** Next 64-bit word (SplitMix64). */
    long nextLong() {
        state += 0x9e3779b97f4a7c15L;
        long z = state;
        z = (z ^ (z >>> 30)) * 0xbf58476d1ce4e5b9L;
        z = (z ^ (z >>> 27)) * 0x94d049bb133111ebL;
        return z ^ (z >>> 31);
    }

    /** Uniform in the open interval (0, 1): (k + 0.5) / 2^53 for a 53-bit k. */
    double nextUniform() {
        return ((nextLong() >>> 11) + 0.5) * 0x1.0p-53;
    }

    /** Standard normal (Box-Muller; the second value of each pair is kept for the next call). */
    double nextGaussian() {
        if (!Double.isNaN(spare)) {
            double s = spare;
            spare = Double.NaN;
            return s;
        }
        double u1 = nextUniform();
        double u2 = nextUniform();
        double r = StrictMath.sqrt(-2 * StrictMath.log(u1));
        double a = 2 * StrictMath.PI * u2;
        spare = r * StrictMath.sin(a);
        return r * StrictMath.cos(a);
    }
}
