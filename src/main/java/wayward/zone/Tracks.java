package wayward.zone;

/**
 * The track table of one {@link MoverTracker}, one array per figure, indexed by slot (a structure of arrays, so
 * that following movers allocates nothing). Package-private fields: the tracker and {@link Jumps} read and write
 * them directly; a slot is in use while {@link #live} is set.
 */
final class Tracks {
    final long[] id;
    final boolean[] live;
    final double[] born;
    /** Stream seconds when last seen (NaN: not yet). */
    final double[] seenAt;
    /**
     * Stream seconds its centroid stands for: the earlier frame of the flow it was last seen in (the flow's field
     * lies on the earlier frame, so the moving samples are where the mover was then); NaN: not yet.
     */
    final double[] placedAt;
    /** Centroid when last seen, analysis pixels. */
    final double[] x;
    final double[] y;
    /** Velocity, px per second. */
    final double[] vx;
    final double[] vy;
    /** Travel against the heading: the larger of the flow's and the centroid's sums. */
    final double[] travel;
    final double[] flowTravel;
    final double[] centroidTravel;
    /** The centroid where it was last seen inside the zone (NaN: not yet, or outside since). */
    final double[] entryX;
    final double[] entryY;
    /** Velocity its next centroid is predicted with, px per second. */
    final double[] predVx;
    final double[] predVy;
    final double[] distance;
    final double[] movingSeconds;
    final int[] samples;
    final int[] peak;
    final int[] w;
    final int[] h;
    /** The group paired with it this frame (-1: none). */
    final int[] group;
    /** Its group was found by a jump this frame (see {@link Jumps}). */
    final boolean[] jumped;
    /** Where and when its run of jumps began (its centroid before the first), and how many jumps in a row. */
    final double[] jumpX;
    final double[] jumpY;
    final double[] jumpT;
    final int[] jumps;
    private long nextId = 1;

    Tracks(int capacity) {
        id = new long[capacity];
        live = new boolean[capacity];
        born = new double[capacity];
        seenAt = new double[capacity];
        placedAt = new double[capacity];
        x = new double[capacity];
        y = new double[capacity];
        vx = new double[capacity];
        vy = new double[capacity];
        travel = new double[capacity];
        flowTravel = new double[capacity];
        centroidTravel = new double[capacity];
        entryX = new double[capacity];
        entryY = new double[capacity];
        predVx = new double[capacity];
        predVy = new double[capacity];
        distance = new double[capacity];
        movingSeconds = new double[capacity];
        samples = new int[capacity];
        peak = new int[capacity];
        w = new int[capacity];
        h = new int[capacity];
        group = new int[capacity];
        jumped = new boolean[capacity];
        jumpX = new double[capacity];
        jumpY = new double[capacity];
        jumpT = new double[capacity];
        jumps = new int[capacity];
    }

    int capacity() {
        return id.length;
    }

    /** Starts a new track in a free slot, paired with group g at stream second t; -1 when every slot is taken. */
    int start(int g, double t) {
        for (int k = 0; k < id.length; k++) {
            if (!live[k]) {
                live[k] = true;
                id[k] = nextId++;
                born[k] = t;
                seenAt[k] = Double.NaN;
                placedAt[k] = Double.NaN;
                travel[k] = 0;
                flowTravel[k] = 0;
                centroidTravel[k] = 0;
                entryX[k] = Double.NaN;
                distance[k] = 0;
                movingSeconds[k] = 0;
                peak[k] = 0;
                jumps[k] = 0;
                group[k] = g;
                return k;
            }
        }
        return -1;
    }
}
