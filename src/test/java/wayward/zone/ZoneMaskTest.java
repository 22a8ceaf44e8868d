package wayward.zone;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class ZoneMaskTest {
    private static String picture(ZoneMask m) {
        StringBuilder b = new StringBuilder();
        for (int y = 0; y < m.height; y++) {
            for (int x = 0; x < m.width; x++) {
                b.append(m.contains(x, y) ? '#' : '.');
            }
            b.append('\n');
        }
        return b.toString();
    }

    @Test
    void rectangleCoversPixelsWhoseCentresAreInside() {
        // 8x4 frame, x from 0.25 to 0.75 (2 to 6 px), y from 0.25 to 1 (1 to 4 px): centres 2.5..5.5, 1.5..3.5
        ZoneMask m = ZoneMask.rasterise(new double[] {0.25, 0.75, 0.75, 0.25}, new double[] {0.25, 0.25, 1, 1}, 8, 4);
        assertEquals(""
                + "........\n"
                + "..####..\n"
                + "..####..\n"
                + "..####..\n", picture(m));
        assertEquals(12, m.size());
    }

    @Test
    void triangleMatchesHandComputedMask() {
        // corners (0,0), (8,0), (0,8) px in an 8x8 frame: a centre (x+0.5, y+0.5) is inside when x + y + 1 < 8
        ZoneMask m = ZoneMask.rasterise(new double[] {0, 1, 0}, new double[] {0, 0, 1}, 8, 8);
        assertEquals(""
                + "#######.\n"
                + "######..\n"
                + "#####...\n"
                + "####....\n"
                + "###.....\n"
                + "##......\n"
                + "#.......\n"
                + "........\n", picture(m));
    }

    @Test
    void concavePolygonUsesEvenOddRule() {
        // a U shape: two prongs joined at the bottom, 6x4 frame
        double[] xs = {0, 1, 1, 4 / 6.0, 4 / 6.0, 2 / 6.0, 2 / 6.0, 0};
        double[] ys = {0, 0, 1, 1, 0.5, 0.5, 1, 1};
        ZoneMask m = ZoneMask.rasterise(xs, ys, 6, 4);
        assertEquals(""
                + "######\n"
                + "######\n"
                + "##..##\n"
                + "##..##\n", picture(m));
    }

    @Test
    void gridMaskTakesTheSamplesWhosePixelsAreInside() {
        // 16x8 picture sampled every 4 px: samples at pixels 2, 6, 10, 14 (x) and 2, 6 (y)
        wayward.flow.FlowField field = new wayward.flow.FlowField(16, 8, 4);
        // x from 0.25 to 0.75 of 16 px = 4..12: pixel centres 6.5 and 10.5 inside, 2.5 and 14.5 outside
        ZoneMask m = ZoneMask.rasterise(new double[] {0.25, 0.75, 0.75, 0.25}, new double[] {0, 0, 1, 1}, field);
        assertEquals(4, m.width);
        assertEquals(2, m.height);
        assertEquals(""
                + ".##.\n"
                + ".##.\n", picture(m));
    }

    @Test
    void samePolygonScalesWithResolution() {
        double[] xs = {0.1, 0.9, 0.9, 0.1};
        double[] ys = {0.1, 0.1, 0.9, 0.9};
        assertEquals(64, ZoneMask.rasterise(xs, ys, 10, 10).size());
        assertEquals(256, ZoneMask.rasterise(xs, ys, 20, 20).size());
    }
}
