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
}
