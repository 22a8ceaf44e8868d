package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * A textured square moving over still textured ground: the flow must hold the square's motion and keep the
 * ground around it still. Analytic ground truth: both textures are sums of sinusoids evaluated at exact
 * positions ({@link Textures}), the square's edges anti-aliased by exact area coverage, so the truth is the
 * square's displacement on every pixel it covers in the first frame and zero on the ground it covers in
 * neither frame.
 */
class MotionBoundaryTest {
    private static final int W = 320;
    private static final int H = 240;

    /** Square side, pixels, centre and displacement of the mover between the frames. */
    private static final double SIDE = 24;
    private static final double CX = 150.3;
    private static final double CY = 118.6;
    private static final double DX = 3.2;
    private static final double DY = -1.9;

    private static double cover(double x, double lo, double hi) {
        return Math.max(0, Math.min(x + 0.5, hi) - Math.max(x - 0.5, lo));
    }

    private static double coverage(int x, int y, double cx, double cy) {
        return cover(x - cx, -SIDE / 2, SIDE / 2) * cover(y - cy, -SIDE / 2, SIDE / 2);
    }

    private static byte[] frame(Textures ground, Textures mover, double cx, double cy, SplittableRandom r) {
        byte[] out = new byte[W * H];
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                double c = coverage(x, y, cx, cy);
                // the mover's texture travels with it: sampled in its own coordinates
                double v = (1 - c) * ground.at(x, y) + c * mover.at(x - cx, y - cy);
                v += 1.5 * r.nextGaussian();
                out[y * W + x] = (byte) Math.max(0, Math.min(255, Math.round(v)));
            }
        }
        return out;
    }

    /** {caught share, mean EPE in the square, mean EPE on the ring of still ground within 6 px}. */
    private static double[] score(FlowField f) {
        int n = 0;
        int caught = 0;
        int rn = 0;
        double epe = 0;
        double ring = 0;
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                int i = y * W + x;
                double c1 = coverage(x, y, CX - DX / 2, CY - DY / 2);
                double c2 = coverage(x, y, CX + DX / 2, CY + DY / 2);
                if (c1 >= 0.5) {
                    double e = Math.hypot(f.u[i] - DX, f.v[i] - DY);
                    n++;
                    epe += e;
                    caught += e <= 1 ? 1 : 0;
                } else if (c1 == 0 && c2 == 0) {
                    double ox = Math.max(0, Math.abs(x - (CX - DX / 2)) - SIDE / 2);
                    double oy = Math.max(0, Math.abs(y - (CY - DY / 2)) - SIDE / 2);
                    if (Math.hypot(ox, oy) <= 6) {
                        rn++;
                        ring += Math.hypot(f.u[i], f.v[i]);
                    }
                }
            }
        }
        return new double[] {(double) caught / n, epe / n, ring / rn};
    }

    /** Scores of the densified and of the bilinearly blended grid flow of the mover moved over the ground. */
    private static double[][] densifiedAndBlended(Textures ground, Textures mover, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        // half the motion before, half after, so both frames are equally resampled (common practice)
        byte[] a = frame(ground, mover, CX - DX / 2, CY - DY / 2, r);
        byte[] b = frame(ground, mover, CX + DX / 2, CY + DY / 2, r);
        GridLucasKanadeFlow flow = new GridLucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField grid = flow.newField();
        flow.compute(a, b, grid);
        FlowField dense = new FlowField(W, H);
        flow.densify(grid, dense);
        return new double[][] {score(dense), score(grid.toDense())};
    }

    private static String figures(double[] ours, double[] blended) {
        return String.format(Locale.ROOT, "densified: caught %.2f, EPE %.2f px, ring %.2f px; "
                + "bilinear: caught %.2f, EPE %.2f px, ring %.2f px", ours[0], ours[1], ours[2], blended[0],
                blended[1], blended[2]);
    }

    @Test
    void aSmallMoverKeepsItsMotionAndTheGroundStaysStill() {
        double[][] both = densifiedAndBlended(new Textures(11, 12), new Textures(29, 12), 5);
        double[] ours = both[0];
        double[] blended = both[1];
        String figures = figures(ours, blended);
        System.out.println(figures);
        // the mover is 24 px, 6 grid points across: most of it must carry its own motion (within 1 px)
        assertTrue(ours[0] >= 0.8, figures);
        assertTrue(ours[1] <= 1.0, figures);
        // the still ground beside it must not be dragged far (measured 1.10 px on this pair at stop 14, 0.78 px at
        // stop 18 (adaptive windows, pixel settle); the
        // aim of 0.5 px is not reached yet: windows across the boundary still blend both sides)
        assertTrue(ours[2] <= 1.5, figures);
        // and choosing each pixel's side beats blending the grid across the boundary
        assertTrue(ours[2] < blended[2], figures);
    }

    @Test
    void densePixelsBesideAPlainSquareOnPlainGroundStayStill() {
        // the dense output: pixels of plain ground between the outline and the first grid points outside it match
        // both motions, and the grid points whose windows reach the outline carry the square's motion; framed by
        // moving structure on one side only, they must read still (truth: zero), while the square's plain inside,
        // framed on every side, keeps its motion
        double[][] both = densifiedAndBlended(Textures.of((x, y) -> 100), Textures.of((x, y) -> 160), 11);
        double[] ours = both[0];
        double[] blended = both[1];
        String figures = figures(ours, blended);
        System.out.println(figures);
        assertTrue(ours[0] >= 0.8, figures);
        // 3.7 px of motion: a ring reading the square's motion on a tenth of its pixels is at 0.37. Measured 0.20
        // px at 2026-12-03 (the pixels next to the outline, whose gradient is the outline's, keep its motion);
        // about 1.2 px before flat pixels were settled, 1.92 px blended bilinearly
        assertTrue(ours[2] <= 0.3, figures);
        assertTrue(ours[2] < blended[2], figures);
    }

    @Test
    void aPlainSquareOnPlainGroundMovesInsideAndTheGroundAroundItStaysStill() {
        // plain paint on a plain yard: only the outline shows motion. Inside the outline the fill must carry it;
        // outside, the flat ground frames the square on one side only and must read still (truth: zero)
        Textures ground = Textures.of((x, y) -> 100);
        Textures paint = Textures.of((x, y) -> 160);
        SplittableRandom r = new SplittableRandom(7);
        byte[] a = frame(ground, paint, CX - DX / 2, CY - DY / 2, r);
        byte[] b = frame(ground, paint, CX + DX / 2, CY + DY / 2, r);
        GridLucasKanadeFlow flow = new GridLucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField grid = flow.newField();
        flow.compute(a, b, grid);
        int inside = 0;
        int insideCaught = 0;
        double outsideWorst = 0;
        for (int j = 0; j < grid.height; j++) {
            for (int i = 0; i < grid.width; i++) {
                int g = j * grid.width + i;
                double x = i * grid.stride + grid.stride / 2;
                double y = j * grid.stride + grid.stride / 2;
                double ox = Math.abs(x - (CX - DX / 2)) - SIDE / 2;
                double oy = Math.abs(y - (CY - DY / 2)) - SIDE / 2;
                if (ox <= -4 && oy <= -4) { // a grid step inside the outline
                    inside++;
                    insideCaught += Math.hypot(grid.u[g] - DX, grid.v[g] - DY) <= 1 ? 1 : 0;
                } else if (Math.max(ox, oy) >= 8) { // two grid steps outside it: no window reaches the square
                    outsideWorst = Math.max(outsideWorst, Math.hypot(grid.u[g], grid.v[g]));
                }
            }
        }
        String figures = String.format(Locale.ROOT, "inside: %d of %d within 1 px; outside: worst %.3f px",
                insideCaught, inside, outsideWorst);
        assertTrue(insideCaught >= 0.75 * inside, figures);
        assertTrue(outsideWorst == 0, figures);
    }

    @Test
    void densifyReproducesAUniformGridExactly() {
        // analytic: when every grid point holds the same motion, every pixel must get it, whatever the residuals
        Textures t = new Textures(3, 12);
        SplittableRandom r = new SplittableRandom(1);
        byte[] a = t.render(W, H, 0, 0, 0, r);
        byte[] b = t.render(W, H, 1, 0, 0, r);
        GridLucasKanadeFlow flow = new GridLucasKanadeFlow(W, H, FlowSettings.defaults());
        FlowField grid = flow.newField();
        flow.compute(a, b, grid);
        java.util.Arrays.fill(grid.u, 1.25f);
        java.util.Arrays.fill(grid.v, -0.5f);
        FlowField dense = new FlowField(W, H);
        flow.densify(grid, dense);
        for (int i = 0; i < W * H; i++) {
            assertTrue(Math.abs(dense.u[i] - 1.25f) < 1e-5f && Math.abs(dense.v[i] + 0.5f) < 1e-5f,
                    "pixel " + i + ": " + dense.u[i] + ", " + dense.v[i]);
        }
    }
}
