package wayward.flow;

import jdk.incubator.vector.FloatVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The fill's inner points, as many at a time as the machine's widest float vector holds (16 with AVX-512, 8 with
 * AVX2): the same operations as {@code GridLucasKanadeFlow.fillPoint} in the same order, lane by lane, its
 * branches as blends, so every lane's result has the same bits. Loaded only where the JVM has the
 * {@code jdk.incubator.vector} module ({@link FillKernel#best()}).
 */
final class VectorFill implements FillKernel {
    private static final VectorSpecies<Float> SPECIES = FloatVector.SPECIES_PREFERRED;

    static int lanes() {
        return SPECIES.length();
    }

    @Override
    public int inside(FillPass pass, int from, int to) {
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
                    final FloatVector alike = wq.div(apart.add(1f)).blend(0f, apart.compare(VectorOperators.LT, 4f).not());
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
}
