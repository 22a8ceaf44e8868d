package wayward.zone;

import java.util.Arrays;
import wayward.flow.FlowField;

/**
 * The moving samples of one flow field and their coherent groups, for {@link MoverTracker}: which samples move
 * (full vectors, normal flow on straight edges, or a slow average) and which are still textured ground, and the
 * connected groups of samples moving alike with each group's size, box, centroid and least-squares velocity (see
 * the tracker's class comment for the grouping). Every array is sized at construction from the sample grid; groups
 * may grow past the zone. {@link #find} allocates nothing.
 *
 * <p><b>What moves.</b> The picture's common motion is subtracted first when the camera's motion is removed.
 * A sample whose structure tensor's smaller eigenvalue reaches the confidence floor votes with its flow. One
 * below that floor whose larger eigenvalue reaches it lies on a straight edge, where only the motion across the
 * edge is measured (the aperture problem): it votes with its normal flow s·n, s = (u, v)·n. A plain van's roof
 * only shows its motion at its rim, and those rim samples are what makes it a mover. A sample with neither
 * does not move. The group's velocity is the least-squares velocity of all its constraints: a full sample
 * says V = (u, v), an edge sample says V·n = s (the intersection of constraints of Adelson &amp; Movshon 1982),
 * lightly regularised so that a group of parallel edges alone reads its motion across them.
 *
 * <p><b>Slow movers.</b> A crawl of half a pixel per analysed frame is below the speed floor, and lowering the
 * floor lets sensor noise through. Instead every sample keeps an exponential average of its vote (time
 * constant {@link MoverSettings#slowSeconds}, in stream time): noise, which changes sign from frame to frame,
 * averages towards 0 (its spread shrinks by about √(α / (2 − α)), a quarter at 0.75 s and 10 frames a second),
 * while a steady crawl keeps its value. A sample also moves when its averaged flow reaches the slow floor and its
 * present flow agrees with the average (its projection on the average is at least half the average's length):
 * the agreement test keeps the decaying average behind a fast mover that has passed from reading as a trail.
 * This was chosen over integrating along tracks because noise alone then never forms the groups that tracks
 * would have to follow.
 */
final class MoverGroups {
    static final byte NONE = 0;
    static final byte FULL = 1;
    static final byte EDGE = 2;
    /** A textured sample (full vector) that does not move: still ground. */
    static final byte STILL = 3;

    final int gridWidth;
    final int gridHeight;
    final int stride;
    private final MoverSettings settings;
    private final boolean removeCameraMotion;
    private final float cosGroup;
    private final float cosEdge;

    // per sample of the grid
    private final int[] idx;
    private final boolean[] inZone;
    final float[] px;
    final float[] py;
    private final float[] emaU;
    private final float[] emaV;
    private final float[] wu;
    private final float[] wv;
    private final float[] nx;
    private final float[] ny;
    final byte[] kind;
    private final int[] label;
    private final int[] queue;

    // per group, indexed by group number below {@link #groups}
    final int[] count;
    final int[] minI;
    final int[] maxI;
    final int[] minJ;
    final int[] maxJ;
    final double[] sumX;
    final double[] sumY;
    /** Least-squares velocity, px per frame pair. */
    final double[] vu;
    final double[] vv;
    private final double[] a11;
    private final double[] a12;
    private final double[] a22;
    private final double[] b1;
    private final double[] b2;
    private final float[] dirX;
    private final float[] dirY;
    /** Groups found in the last field. */
    int groups;

    MoverGroups(ZoneMask mask, FlowField layout, MoverSettings settings, boolean removeCameraMotion) {
        this.gridWidth = mask.width;
        this.gridHeight = mask.height;
        this.stride = layout.stride;
        this.settings = settings;
        this.removeCameraMotion = removeCameraMotion;
        this.cosGroup = (float) Math.cos(Math.toRadians(settings.groupAngleDeg()));
        this.cosEdge = (float) Math.cos(Math.toRadians(Math.min(85, settings.groupAngleDeg() + 30)));
        idx = mask.indices();
        int n = gridWidth * gridHeight;
        inZone = new boolean[n];
        for (int k : idx) {
            inZone[k] = true;
        }
        px = new float[n];
        py = new float[n];
        for (int k = 0; k < n; k++) {
            px[k] = layout.pixelX(k % gridWidth);
            py[k] = layout.pixelY(k / gridWidth);
        }
        emaU = new float[n];
        emaV = new float[n];
        wu = new float[n];
        wv = new float[n];
        nx = new float[n];
        ny = new float[n];
        kind = new byte[n];
        label = new int[n];
        queue = new int[n];
        count = new int[n];
        minI = new int[n];
        maxI = new int[n];
        minJ = new int[n];
        maxJ = new int[n];
        sumX = new double[n];
        sumY = new double[n];
        vu = new double[n];
        vv = new double[n];
        a11 = new double[n];
        a12 = new double[n];
        a22 = new double[n];
        b1 = new double[n];
        b2 = new double[n];
        dirX = new float[n];
        dirY = new float[n];
    }

    /** The zone's samples. */
    int zoneSamples() {
        return idx.length;
    }

    /** Forgets the averaged flow (the flow restarted after a gap). */
    void reset() {
        Arrays.fill(emaU, 0f);
        Arrays.fill(emaV, 0f);
    }

    /** Classifies the samples of {@code flow}, dt seconds after the last, and groups the moving ones. */
    void find(FlowField flow, double dt) {
        classify(flow, dt);
        group();
    }

    double centroidX(int g) {
        return sumX[g] / count[g];
    }

    double centroidY(int g) {
        return sumY[g] / count[g];
    }

    /** The larger side of group g's box, analysis pixels. */
    int side(int g) {
        return stride * Math.max(maxI[g] - minI[g] + 1, maxJ[g] - minJ[g] + 1);
    }

    /** Votes, averaged flow and which samples move. */
    private void classify(FlowField flow, double dt) {
        final int n = gridWidth * gridHeight;
        final float[] u = flow.u;
        final float[] v = flow.v;
        final float[] conf = flow.confidence;
        final float[] edge = flow.edge;
        final float minConf = (float) settings.minConfidence();
        final float camU = removeCameraMotion ? flow.globalU : 0f;
        final float camV = removeCameraMotion ? flow.globalV : 0f;
        final float minStep = (float) (settings.minSpeedPxPerSecond() * dt);
        final float minStep2 = minStep * minStep;
        final boolean slow = settings.slowSeconds() > 0;
        final float slowStep = (float) (settings.slowMinSpeedPxPerSecond() * dt);
        final float slowStep2 = slowStep * slowStep;
        // the average starts from zero: seeding it with a first noisy frame would make every sample slow-moving
        final float alpha = !slow ? 1f : (float) (1 - Math.exp(-dt / settings.slowSeconds()));
        for (int k = 0; k < n; k++) {
            final int i = k;
            final float du = u[i] - camU;
            final float dv = v[i] - camV;
            float voteU;
            float voteV;
            byte what;
            if (conf[i] >= minConf) {
                voteU = du;
                voteV = dv;
                what = FULL;
            } else if (edge[i] >= minConf) {
                final float ex = flow.normalX[i];
                final float ey = flow.normalY[i];
                final float s = du * ex + dv * ey;
                voteU = s * ex;
                voteV = s * ey;
                nx[k] = ex;
                ny[k] = ey;
                what = EDGE;
            } else {
                voteU = 0f;
                voteV = 0f;
                what = NONE;
            }
            final float au = emaU[k] + alpha * (voteU - emaU[k]);
            final float av = emaV[k] + alpha * (voteV - emaV[k]);
            emaU[k] = au;
            emaV[k] = av;
            final float m2 = voteU * voteU + voteV * voteV;
            if (what != NONE && m2 >= minStep2 && m2 > 0f) {
                wu[k] = voteU;
                wv[k] = voteV;
                kind[k] = what;
            } else if (what != NONE && slow) {
                final float a2 = au * au + av * av;
                if (a2 >= slowStep2 && a2 > 0f && voteU * au + voteV * av >= 0.5f * a2) {
                    wu[k] = au;
                    wv[k] = av;
                    kind[k] = what;
                } else {
                    kind[k] = what == FULL ? STILL : NONE;
                }
            } else {
                kind[k] = what == FULL ? STILL : NONE;
            }
        }
    }

    /** Connected groups of samples moving alike: full samples seed first, then edge samples. */
    private void group() {
        final int[] ix = idx;
        Arrays.fill(label, -1);
        groups = 0;
        for (int pass = 0; pass < 2; pass++) {
            final byte seedKind = pass == 0 ? FULL : EDGE;
            for (int z = 0; z < ix.length; z++) {
                final int k = ix[z];
                if (kind[k] != seedKind || label[k] >= 0) {
                    continue;
                }
                grow(k, groups++);
            }
        }
        for (int g = 0; g < groups; g++) {
            solve(g);
        }
    }

    private void grow(int seed, int g) {
        final int w = gridWidth;
        final int h = gridHeight;
        count[g] = 0;
        minI[g] = Integer.MAX_VALUE;
        maxI[g] = Integer.MIN_VALUE;
        minJ[g] = Integer.MAX_VALUE;
        maxJ[g] = Integer.MIN_VALUE;
        sumX[g] = 0;
        sumY[g] = 0;
        a11[g] = 0;
        a12[g] = 0;
        a22[g] = 0;
        b1[g] = 0;
        b2[g] = 0;
        dirX[g] = 0f;
        dirY[g] = 0f;
        int head = 0;
        int tail = 0;
        label[seed] = g;
        add(seed, g);
        queue[tail++] = seed;
        while (head < tail) {
            final int k = queue[head++];
            final int i0 = k % w;
            final int j0 = k / w;
            for (int j = Math.max(0, j0 - 2); j <= Math.min(h - 1, j0 + 2); j++) {
                final int row = j * w;
                for (int i = Math.max(0, i0 - 2); i <= Math.min(w - 1, i0 + 2); i++) {
                    final int q = row + i;
                    if (label[q] >= 0 || (kind[q] != FULL && kind[q] != EDGE)) {
                        continue;
                    }
                    final float dx = dirX[g];
                    final float dy = dirY[g];
                    final float dot = wu[q] * dx + wv[q] * dy;
                    final float lim = kind[q] == FULL ? cosGroup : cosEdge;
                    final float len = (float) Math.sqrt((wu[q] * wu[q] + wv[q] * wv[q]) * (dx * dx + dy * dy));
                    if (dot < lim * len) {
                        continue;
                    }
                    label[q] = g;
                    add(q, g);
                    queue[tail++] = q;
                }
            }
        }
    }

    private void add(int k, int g) {
        final int i = k % gridWidth;
        final int j = k / gridWidth;
        count[g]++;
        if (i < minI[g]) {
            minI[g] = i;
        }
        if (i > maxI[g]) {
            maxI[g] = i;
        }
        if (j < minJ[g]) {
            minJ[g] = j;
        }
        if (j > maxJ[g]) {
            maxJ[g] = j;
        }
        sumX[g] += px[k];
        sumY[g] += py[k];
        final float a = wu[k];
        final float b = wv[k];
        final float m = (float) Math.sqrt(a * a + b * b);
        dirX[g] += a / m;
        dirY[g] += b / m;
        if (kind[k] == FULL) {
            a11[g] += 1;
            a22[g] += 1;
            b1[g] += a;
            b2[g] += b;
        } else {
            // one constraint V·n = s; the vote is s·n, so s = vote·n
            final float ex = nx[k];
            final float ey = ny[k];
            final float s = a * ex + b * ey;
            a11[g] += ex * ex;
            a12[g] += ex * ey;
            a22[g] += ey * ey;
            b1[g] += s * ex;
            b2[g] += s * ey;
        }
    }

    /** The group's least-squares velocity, px per frame pair. */
    private void solve(int g) {
        final double eps = 0.01 * count[g];
        final double a = a11[g] + eps;
        final double b = a12[g];
        final double c = a22[g] + eps;
        final double det = a * c - b * b;
        vu[g] = (c * b1[g] - b * b2[g]) / det;
        vv[g] = (a * b2[g] - b * b1[g]) / det;
    }

    /** True when the sample nearest to the point (analysis pixels) is one of the zone's. */
    boolean centreInZone(double x, double y) {
        int k = sampleAt(x, y);
        return k >= 0 && inZone[k];
    }

    /** Index of the sample nearest to the point (analysis pixels), or -1 outside the sample grid. */
    int sampleAt(double x, double y) {
        final int half = stride / 2; // as FlowField.pixelX places samples: whole pixels
        int i = (int) Math.round((x - half) / stride);
        int j = (int) Math.round((y - half) / stride);
        return i >= 0 && j >= 0 && i < gridWidth && j < gridHeight ? j * gridWidth + i : -1;
    }
}
