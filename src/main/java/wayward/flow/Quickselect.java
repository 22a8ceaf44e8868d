package wayward.flow;

/** The k-th smallest of an array's first n values, in linear time on average, in place. */
public final class Quickselect {
    private Quickselect() {
    }

    /** The k-th smallest (0-based) of a[0..n) by Hoare's selection (1961); reorders a, allocates nothing. */
    public static float kth(float[] a, int n, int k) {
        int lo = 0;
        int hi = n - 1;
        while (lo < hi) {
            final float pivot = a[(lo + hi) >>> 1];
            int i = lo;
            int j = hi;
            while (i <= j) {
                while (a[i] < pivot) {
                    i++;
                }
                while (a[j] > pivot) {
                    j--;
                }
                if (i <= j) {
                    final float t = a[i];
                    a[i] = a[j];
                    a[j] = t;
                    i++;
                    j--;
                }
            }
            if (k <= j) {
                hi = j;
            } else if (k >= i) {
                lo = i;
            } else {
                break;
            }
        }
        return a[k];
    }

    /** Values {@link #kth(float[], int, int, float[], float[])} samples to bracket the k-th smallest. */
    static final int SAMPLE = 128;
    /** Ranks of the sample either side of the k-th's place that bracket it: about 3 standard deviations. */
    static final int SAMPLE_MARGIN = 18;

    /**
     * The k-th smallest (0-based) of a[0..n), the same value as {@link #kth(float[], int, int)}, for large arrays of
     * unpredictable order. Hoare's selection there mispredicts about every other comparison; here a sorted sample of
     * {@link #SAMPLE} values brackets the k-th smallest (after Floyd &amp; Rivest 1975), one pass counts the values
     * below the bracket and copies those inside it to the other array without branching on them, and the same
     * runs again on that much smaller set until Hoare's selection takes the rest. Where a bracket misses (rarely)
     * Hoare's selection runs on the set before it. Overwrites a and {@code other} (at least n values);
     * {@code sample} holds at least {@link #SAMPLE}. Allocates nothing.
     */
    public static float kth(float[] a, int n, int k, float[] other, float[] sample) {
        float[] from = a;
        float[] to = other;
        while (n >= 4 * SAMPLE) {
            for (int i = 0; i < SAMPLE; i++) {
                sample[i] = from[(int) ((long) i * n / SAMPLE)];
            }
            java.util.Arrays.sort(sample, 0, SAMPLE);
            final int at = (int) ((long) k * SAMPLE / n);
            final float lo = sample[Math.max(0, at - SAMPLE_MARGIN)];
            final float hi = sample[Math.min(SAMPLE - 1, at + SAMPLE_MARGIN)];
            int below = 0;
            int m = 0;
            for (int i = 0; i < n; i++) {
                final float x = from[i];
                below += x < lo ? 1 : 0;
                to[m] = x;
                m += (x >= lo) & (x <= hi) ? 1 : 0;
            }
            final int kk = k - below;
            // a miss, or no set to gain (ties may fill the whole bracket): Hoare's selection takes over
            if (kk < 0 || kk >= m || m > n / 2) {
                break;
            }
            final float[] t = from;
            from = to;
            to = t;
            n = m;
            k = kk;
        }
        return kth(from, n, k);
    }
}
