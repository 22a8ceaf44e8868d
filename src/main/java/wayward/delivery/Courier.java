package wayward.delivery;

import java.io.IOException;
import java.util.ArrayDeque;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicLong;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.retry.Backoff;
import java.util.concurrent.CompletableFuture;
import wayward.secret.LogText;

/**
 * Carries event phases from the outbox to one destination, in outbox order, on its own thread. Up to the
 * destination's window is outstanding at once; progress advances (and is forced to disk) only past phases
 * that were delivered or refused for good, so after a crash or restart delivery resumes where it stopped and
 * a phase is delivered at least once. Failed attempts are retried forever with exponential backoff and jitter;
 * what a destination cannot take stays in the outbox.
 */
public final class Courier {
    private static final Logger LOG = LoggerFactory.getLogger(Courier.class);

    private final Outbox outbox;
    private final Destination destination;
    private final OutboxProgress progress;
    private final SetAside setAside;
    private final Outbox.Reader reader;
    private final long baseBackoffMillis;
    private final long maxBackoffMillis;
    private final Thread thread;
    private final AtomicLong delivered = new AtomicLong();
    private final AtomicLong refused = new AtomicLong();
    private final AtomicLong retries = new AtomicLong();
    private volatile long drainUntilNanos = Long.MAX_VALUE;
    private volatile boolean draining;
    /** Why the courier thread ended before it was asked to (null while it runs or after an orderly stop). */
    private volatile String stoppedBy;

    private static final class Pending {
        final long seq;
        final Event event;
        CompletableFuture<Destination.Result> answer;
        int attempts = 1;

        Pending(long seq, Event event, CompletableFuture<Destination.Result> answer) {
            this.seq = seq;
            this.event = event;
            this.answer = answer;
        }
    }

    public Courier(Outbox outbox, Destination destination, long baseBackoffMillis, long maxBackoffMillis)
            throws IOException {
        this.outbox = outbox;
        this.destination = destination;
        this.progress = outbox.progress(destination.key());
        this.setAside = new SetAside(outbox.setAsideFile(destination.key()));
        this.reader = outbox.reader(progress.next());
        this.baseBackoffMillis = baseBackoffMillis;
        this.maxBackoffMillis = Math.max(baseBackoffMillis, maxBackoffMillis);
        this.thread = new Thread(this::loop, "deliver-" + destination.key());
        this.thread.setDaemon(true);
    }

    public void start() {
        long backlog = Math.max(0, outbox.nextSeq() - progress.next());
        if (backlog > 0) {
            LOG.info("{}: {} event phases waiting in the outbox from before; delivering them first",
                    destination.name(), backlog);
        }
        thread.start();
    }

    public Destination destination() {
        return destination;
    }

    public long delivered() {
        return delivered.get();
    }

    public long refused() {
        return refused.get();
    }

    public long retries() {
        return retries.get();
    }

    /** Why delivery to this destination stopped on its own (a disk error), or null while it goes on. */
    public String stoppedBy() {
        return stoppedBy;
    }

    /** Event phases in the outbox this destination has not yet taken. */
    public long pending() {
        return Math.max(0, outbox.nextSeq() - progress.next());
    }

    /** The next outbox seq this destination still has to take. */
    public long next() {
        return progress.next();
    }

    private void loop() {
        ArrayDeque<Pending> pending = new ArrayDeque<>();
        boolean caughtUp = false;
        Backoff backoff = new Backoff(baseBackoffMillis, maxBackoffMillis);
        try {
            while (true) {
                while (pending.size() < destination.window()) {
                    Outbox.Entry e = reader.next(pending.isEmpty() ? 200 : 0, TimeUnit.MILLISECONDS);
                    if (e == null) {
                        break;
                    }
                    Event ev;
                    try {
                        ev = EventJson.parse(e.payload());
                    } catch (IllegalArgumentException bad) {
                        LOG.error("{}: outbox record {} is not an event phase ({}); skipped", destination.name(),
                                e.seq(), bad.getMessage());
                        if (pending.isEmpty()) {
                            progress.save(e.seq() + 1);
                        }
                        continue;
                    }
                    pending.add(new Pending(e.seq(), ev, send(e.seq(), ev)));
                }
                if (pending.isEmpty()) {
                    if (!caughtUp) {
                        caughtUp = true;
                        destination.caughtUp();
                    }
                    if (draining) {
                        return;
                    }
                    continue;
                }
                Pending head = pending.peek();
                Destination.Result r;
                try {
                    r = head.answer.get(200, TimeUnit.MILLISECONDS);
                } catch (TimeoutException t) {
                    if (draining && System.nanoTime() > drainUntilNanos) {
                        return;
                    }
                    continue;
                } catch (ExecutionException x) {
                    r = Destination.Result.retry(String.valueOf(x.getCause()));
                }
                switch (r.status()) {
                    case DELIVERED -> {
                        if (head.attempts > 1) {
                            LOG.info("{}: event {} delivered after {} attempts", destination.name(), head.event.id(),
                                    head.attempts);
                        }
                        delivered.incrementAndGet();
                        pending.poll();
                        progress.save(head.seq + 1);
                        backoff.reset();
                    }
                    case REFUSED -> {
                        setAside.add(head.seq, head.event, r.detail());
                        LOG.error("{}: event {} {} {} refused ({}); not retried, kept in {}", destination.name(),
                                head.event.id(), head.event.kind().jsonName(), head.event.phase().jsonName(),
                                r.detail(), setAside.file());
                        refused.incrementAndGet();
                        pending.poll();
                        progress.save(head.seq + 1);
                    }
                    case RETRY -> {
                        long wait = backoff.nextMillis();
                        LOG.warn("{}: event {} attempt {} failed ({}); retrying in {} ms", destination.name(),
                                head.event.id(), head.attempts, r.detail(), wait);
                        if (draining && System.nanoTime() + wait * 1_000_000L > drainUntilNanos) {
                            return;
                        }
                        Thread.sleep(wait);
                        retries.incrementAndGet();
                        head.attempts++;
                        head.answer = send(head.seq, head.event);
                    }
                }
            }
        } catch (InterruptedException ie) {
            Thread.currentThread().interrupt();
        } catch (IOException | RuntimeException e) {
            stoppedBy = LogText.clean(e.toString());
            LOG.error("{}: delivery stopped: {}; what is left stays in the outbox for the next start",
                    destination.name(), stoppedBy);
        } finally {
            try {
                reader.close();
            } catch (IOException e) {
                LOG.debug("{}: {}", destination.name(), e.toString());
            }
        }
    }

    /**
     * The destination's answer to one event phase; a destination that throws (a header it cannot write, a bug)
     * refuses that record rather than stopping the queue behind it.
     */
    private CompletableFuture<Destination.Result> send(long seq, Event ev) {
        try {
            return destination.send(seq, ev);
        } catch (RuntimeException e) {
            return CompletableFuture.completedFuture(Destination.Result.refused("cannot be sent: "
                    + LogText.clean(e.toString())));
        }
    }

    /**
     * Delivers what it can until the outbox is empty for this destination or the deadline passes, then stops
     * the thread and closes the destination. What is left stays in the outbox for the next start.
     */
    public void finish(long deadlineNanos) {
        stopBy(deadlineNanos);
        awaitStop(deadlineNanos);
    }

    /** Asks the thread to stop once the outbox is empty for it or the deadline has passed. */
    public void stopBy(long deadlineNanos) {
        drainUntilNanos = deadlineNanos;
        draining = true;
    }

    /** Waits for the thread (interrupting it after the deadline), then closes the destination. */
    public void awaitStop(long deadlineNanos) {
        try {
            thread.join(Math.max(1, (deadlineNanos - System.nanoTime()) / 1_000_000L) + 500);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        if (thread.isAlive()) {
            thread.interrupt();
            try {
                thread.join(2000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        long left = outbox.nextSeq() - progress.next();
        if (left > 0) {
            LOG.warn("{}: {} event phases not delivered yet; they wait in the outbox ({}) for the next start",
                    destination.name(), left, outbox.folder());
        }
        destination.close();
    }
}
