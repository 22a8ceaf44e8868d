package wayward.flow;

import jdk.incubator.vector.FloatVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * {@link FlowKernel} on vector instructions. The fill takes as many points at a time as the machine's widest float
 * vector holds (16 with AVX-512, 8 with AVX2): the same operations as {@code GridLucasKanadeFlow.fillRows} does
 * point by point, in the same order, lane by lane, its branches as blends. A window's sums take one window row at a
 * time, a column a lane, in the order {@link FlowKernel#windowSums} gives. So every result has the same bits as
 * {@link FlowKernel#SCALAR}'s. Loaded only where the JVM has the {@code jdk.incubator.vector} module
 * ({@link FlowKernel#best()}).
 */
final class VectorKernel implements FlowKernel {
    private static final VectorSpecies<Float> SPECIES = FloatVector.SPECIES_PREFERRED;
    /**
     * A window row's pixels, one a lane: the same shape as the fill's (C2 compiles vectors of two shapes in one
     * program to slow code that allocates every vector: measured, JDK 17).
     */
    private static final VectorSpecies<Float> ROW = SPECIES;

    static int lanes() {
        return SPECIES.length();
    }

    @Override
    public int fillInside(FillPass pass, int from, int to) {
        final int gw = pass.gridWidth;
        final float[] u = pass.u;
        final float[] v = pass.v;
        final float[] ta = pass.a;
        final float[] tb = pass.b;
        final float[] tc = pass.c;
        final float[] kept = pass.kept;
        final float[] near = pass.weight;
        final int stride = pass.weightStride;
        final boolean full = pass.full;
        final int lanes = SPECIES.length();
        int k = from;
        for (; k + lanes <= to; k += lanes) {
            final FloatVector uk = FloatVector.fromArray(SPECIES, u, k);
            final FloatVector vk = FloatVector.fromArray(SPECIES, v, k);
            final FloatVector ak = FloatVector.fromArray(SPECIES, ta, k);
            final FloatVector bk = FloatVector.fromArray(SPECIES, tb, k);
            final FloatVector ck = FloatVector.fromArray(SPECIES, tc, k);
            final VectorMask<Float> keeps = FloatVector.fromArray(SPECIES, kept, k).compare(VectorOperators.NE, 0f);
            FloatVector a = ak.mul(GridLucasKanadeFlow.FILL_SELF).add(GridLucasKanadeFlow.FILL_HOLD);
            FloatVector b = bk.mul(GridLucasKanadeFlow.FILL_SELF);
            FloatVector c = ck.mul(GridLucasKanadeFlow.FILL_SELF).add(GridLucasKanadeFlow.FILL_HOLD);
            FloatVector ru = a.mul(uk).add(b.mul(vk));
            FloatVector rv = b.mul(uk).add(c.mul(vk));
            for (int n = 0; n < GridLucasKanadeFlow.NEIGHBOURS; n++) {
                final int q = k + GridLucasKanadeFlow.NEIGHBOUR_DJ[n] * gw + GridLucasKanadeFlow.NEIGHBOUR_DI[n];
                final FloatVector uq = FloatVector.fromArray(SPECIES, u, q);
                final FloatVector vq = FloatVector.fromArray(SPECIES, v, q);
                FloatVector wq = FloatVector.fromArray(SPECIES, near, n * stride + k);
                if (full) {
                    final FloatVector du = uq.sub(uk);
                    final FloatVector dv = vq.sub(vk);
                    final FloatVector apart = du.mul(du).add(dv.mul(dv)).mul(GridLucasKanadeFlow.FILL_INV_ALIKE);
                    final VectorMask<Float> far = apart.compare(VectorOperators.LT, 4f).not();
                    final FloatVector alike = wq.div(apart.add(1f)).blend(0f, far);
                    wq = wq.blend(alike, keeps);
                }
                final FloatVector qa = wq.mul(FloatVector.fromArray(SPECIES, ta, q));
                final FloatVector qb = wq.mul(FloatVector.fromArray(SPECIES, tb, q));
                final FloatVector qc = wq.mul(FloatVector.fromArray(SPECIES, tc, q));
                a = a.add(qa);
                b = b.add(qb);
                c = c.add(qc);
                ru = ru.add(qa.mul(uq).add(qb.mul(vq)));
                rv = rv.add(qb.mul(uq).add(qc.mul(vq)));
            }
            final FloatVector det = a.mul(c).sub(b.mul(b));
            final VectorMask<Float> solved = det.compare(VectorOperators.GT, 1e-12f);
            FloatVector nu = uk.blend(c.mul(ru).sub(b.mul(rv)).div(det), solved);
            FloatVector nv = vk.blend(a.mul(rv).sub(b.mul(ru)).div(det), solved);
            if (!full) {
                // on the coarse levels a kept point keeps its own motion
                nu = nu.blend(uk, keeps);
                nv = nv.blend(vk, keeps);
            }
            nu.intoArray(pass.nextU, k);
            nv.intoArray(pass.nextV, k);
            a.mul(GridLucasKanadeFlow.FILL_DECAY).blend(ak, keeps).intoArray(pass.nextA, k);
            b.mul(GridLucasKanadeFlow.FILL_DECAY).blend(bk, keeps).intoArray(pass.nextB, k);
            c.mul(GridLucasKanadeFlow.FILL_DECAY).blend(ck, keeps).intoArray(pass.nextC, k);
        }
        return k;
    }

    @Override
    public void windowSums(float[] i0, float[] i1, int w, int corner, int shift, int side, float w00, float w01,
            float w10, float w11, float[] sums) {
        // whole rows of lanes are read: the lanes right of the window add up on their own and are never read, but
        // they must lie in the arrays (a window at the end of the picture is summed by the scalar code)
        final int last = corner + side * w + 1 + ROW.length();
        if (side > ROW.length() || last > i0.length || last + shift > i1.length) {
            FlowKernel.scalarWindowSums(i0, i1, w, corner, shift, side, w00, w01, w10, w11, sums);
            return;
        }
        FloatVector st = FloatVector.zero(ROW);
        FloatVector sx = st;
        FloatVector sy = st;
        FloatVector sxx = st;
        FloatVector sxy = st;
        FloatVector syy = st;
        FloatVector sd = st;
        FloatVector sxd = st;
        FloatVector sdd = st;
        FloatVector syd = st;
        for (int r = 0, p = corner; r < side; r++, p += w) {
            final FloatVector tv = FloatVector.fromArray(ROW, i0, p);
            final FloatVector ix = FloatVector.fromArray(ROW, i0, p + 1)
                    .sub(FloatVector.fromArray(ROW, i0, p - 1));
            final FloatVector iy = FloatVector.fromArray(ROW, i0, p + w)
                    .sub(FloatVector.fromArray(ROW, i0, p - w));
            final int q = p + shift;
            final FloatVector d = FloatVector.fromArray(ROW, i1, q).mul(w00)
                    .add(FloatVector.fromArray(ROW, i1, q + 1).mul(w01))
                    .add(FloatVector.fromArray(ROW, i1, q + w).mul(w10))
                    .add(FloatVector.fromArray(ROW, i1, q + w + 1).mul(w11))
                    .sub(tv);
            st = st.add(tv);
            sx = sx.add(ix);
            sy = sy.add(iy);
            sxx = sxx.add(ix.mul(ix));
            sxy = sxy.add(ix.mul(iy));
            syy = syy.add(iy.mul(iy));
            sd = sd.add(d);
            sxd = sxd.add(ix.mul(d));
            sdd = sdd.add(d.mul(d));
            syd = syd.add(iy.mul(d));
        }
        // the columns left to right, as the scalar variant adds them (a lane reduction's order is unspecified)
        final int n = ROW.length();
        st.intoArray(sums, 10);
        sx.intoArray(sums, 10 + n);
        sy.intoArray(sums, 10 + 2 * n);
        sxx.intoArray(sums, 10 + 3 * n);
        sxy.intoArray(sums, 10 + 4 * n);
        syy.intoArray(sums, 10 + 5 * n);
        sd.intoArray(sums, 10 + 6 * n);
        sxd.intoArray(sums, 10 + 7 * n);
        sdd.intoArray(sums, 10 + 8 * n);
        syd.intoArray(sums, 10 + 9 * n);
        for (int i = 0; i < 10; i++) {
            float total = 0f;
            for (int c = 0, at = 10 + i * n; c < side; c++) {
                total += sums[at + c];
            }
            sums[i] = total;
        }
    }

    @Override
    public void steps(StepRow row, int count) {
        final float[] sums = row.sums;
        final int s = row.stride;
        final float sw = row.pixels;
        final float invN = 1f / sw;
        // as the solve works it out, λ × the weights' sum / the window's pixels (the same two here, but the product
        // and quotient round as they do there)
        final float lam = row.lambda * sw / sw;
        final int lanes = SPECIES.length();
        int i = 0;
        for (; i + lanes <= count; i += lanes) {
            final FloatVector st = FloatVector.fromArray(SPECIES, sums, i);
            final FloatVector sx = FloatVector.fromArray(SPECIES, sums, s + i).mul(0.5f);
            final FloatVector sy = FloatVector.fromArray(SPECIES, sums, 2 * s + i).mul(0.5f);
            final FloatVector sxx = FloatVector.fromArray(SPECIES, sums, 3 * s + i).mul(0.25f);
            final FloatVector sxy = FloatVector.fromArray(SPECIES, sums, 4 * s + i).mul(0.25f);
            final FloatVector syy = FloatVector.fromArray(SPECIES, sums, 5 * s + i).mul(0.25f);
            final FloatVector sd = FloatVector.fromArray(SPECIES, sums, 6 * s + i);
            final FloatVector sxd = FloatVector.fromArray(SPECIES, sums, 7 * s + i).mul(0.5f);
            final FloatVector sdd = FloatVector.fromArray(SPECIES, sums, 8 * s + i);
            final FloatVector syd = FloatVector.fromArray(SPECIES, sums, 9 * s + i).mul(0.5f);
            final FloatVector cxx = sxx.sub(sx.mul(sx).mul(invN));
            final FloatVector cxy = sxy.sub(sx.mul(sy).mul(invN));
            final FloatVector cyy = syy.sub(sy.mul(sy).mul(invN));
            final FloatVector half = cxx.sub(cyy).mul(0.5f).mul(invN);
            final FloatVector e = cxx.add(cyy).mul(0.5f).mul(invN)
                    .sub(half.mul(half).add(cxy.mul(cxy).mul(invN).mul(invN)).lanewise(VectorOperators.SQRT));
            final int g = row.first + i;
            FloatVector.zero(SPECIES).blend(e, e.compare(VectorOperators.GT, 0f)).intoArray(row.confidence, g);
            cxx.mul(invN).intoArray(row.a, g);
            cxy.mul(invN).intoArray(row.b, g);
            cyy.mul(invN).intoArray(row.c, g);
            st.mul(invN).intoArray(row.mean, g);
            st.div(sw).intoArray(row.windowMean, g);
            final FloatVector a = cxx.add(lam);
            final FloatVector c = cyy.add(lam);
            final FloatVector det = a.mul(c).sub(cxy.mul(cxy));
            final VectorMask<Float> solved = det.compare(VectorOperators.GT, 1e-3f);
            final FloatVector ia = c.div(det);
            final FloatVector ib = cxy.neg().div(det);
            final FloatVector ic = a.div(det);
            final FloatVector bx = sxd.sub(sx.mul(sd).mul(invN));
            final FloatVector by = syd.sub(sy.mul(sd).mul(invN));
            final FloatVector du = ia.mul(bx).add(ib.mul(by)).neg();
            final FloatVector dv = ib.mul(bx).add(ic.mul(by)).neg();
            final FloatVector u0 = FloatVector.fromArray(SPECIES, row.u0, i);
            final FloatVector v0 = FloatVector.fromArray(SPECIES, row.v0, i);
            u0.blend(u0.add(du), solved).intoArray(row.u, g);
            v0.blend(v0.add(dv), solved).intoArray(row.v, g);
            final FloatVector left = sdd.sub(sd.mul(sd).mul(invN)).add(bx.mul(du)).add(by.mul(dv));
            FloatVector.zero(SPECIES).blend(left, left.compare(VectorOperators.GT, 0f)).mul(invN)
                    .blend(GridLucasKanadeFlow.UNKNOWN_RESIDUAL, solved.not()).intoArray(row.residual, g);
        }
        FlowKernel.scalarSteps(row, i, count);
    }

    @Override
    public boolean fillWeights(float[] mean, int gw, int gh, float[] near, int stride) {
        final float inv2 = 1f / (GridLucasKanadeFlow.FILL_BRIGHTNESS * GridLucasKanadeFlow.FILL_BRIGHTNESS);
        final int lanes = SPECIES.length();
        final int points = gw * gh;
        // the neighbours after a point in row order (right, then the three below), each pair written to both sides
        // as the scalar loop does; a run over the whole grid also pairs a row's last point with the next row's
        // first, into slots of neighbours outside the grid, which the fill never reads
        for (int n = GridLucasKanadeFlow.NEIGHBOURS / 2; n < GridLucasKanadeFlow.NEIGHBOURS; n++) {
            final int off = GridLucasKanadeFlow.NEIGHBOUR_DJ[n] * gw + GridLucasKanadeFlow.NEIGHBOUR_DI[n];
            final int mirror = (GridLucasKanadeFlow.NEIGHBOURS - 1 - n) * stride;
            final int at = n * stride;
            // the pairs whose later point lies in the grid
            final int end = points - off;
            int k = 0;
            for (; k + lanes <= end; k += lanes) {
                final FloatVector dm = FloatVector.fromArray(SPECIES, mean, k + off)
                        .sub(FloatVector.fromArray(SPECIES, mean, k));
                final FloatVector wq = FloatVector.broadcast(SPECIES, 1f).div(dm.mul(dm).mul(inv2).add(1f));
                wq.intoArray(near, at + k);
                wq.intoArray(near, mirror + k + off);
            }
            for (; k < end; k++) {
                final float dm = mean[k + off] - mean[k];
                final float wq = 1f / (1f + dm * dm * inv2);
                near[at + k] = wq;
                near[mirror + k + off] = wq;
            }
        }
        return true;
    }

    @Override
    public int support(float[] ta, float[] tb, float[] tc, float[] res, float[] conf, float[] sa, float[] sb,
            float[] sc, float[] kept) {
        final float invRes = 1f / GridLucasKanadeFlow.FILL_RESIDUAL;
        final int lanes = SPECIES.length();
        int k = 0;
        for (; k + lanes <= ta.length; k += lanes) {
            final FloatVector r = FloatVector.fromArray(SPECIES, res, k);
            final VectorMask<Float> keeps = FloatVector.fromArray(SPECIES, conf, k)
                    .compare(VectorOperators.GE, GridLucasKanadeFlow.FILL_KEEP)
                    .and(r.compare(VectorOperators.LE, GridLucasKanadeFlow.FILL_RESIDUAL_KEEP));
            FloatVector.zero(SPECIES).blend(1f, keeps).intoArray(kept, k);
            final FloatVector wk = FloatVector.broadcast(SPECIES, 1f).div(r.mul(invRes).add(1f));
            wk.mul(FloatVector.fromArray(SPECIES, ta, k)).intoArray(sa, k);
            wk.mul(FloatVector.fromArray(SPECIES, tb, k)).intoArray(sb, k);
            wk.mul(FloatVector.fromArray(SPECIES, tc, k)).intoArray(sc, k);
        }
        return k;
    }
}
