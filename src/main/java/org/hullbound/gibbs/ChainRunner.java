package org.hullbound.gibbs;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.BooleanSupplier;
import java.util.random.RandomGenerator;

/**
 * Runs several Markov chains in parallel threads: burn-in, thinning, kept draws, progress and a
 * cooperative stop.
 *
 * <p>Each chain has its own generator ({@link ChainSeeds}) and its own kernel, made in chain order
 * before the threads start, so that a seed and a chain count give the same draws bit for bit with
 * one thread or many. The stop signal is read at the end of each sweep: a stopped run has handed on
 * only whole draws.
 *
 * <p>A stop is honoured within a bounded time even when one sweep is slow: between two updates a
 * sweep still running {@link #STOP_GRACE_NANOS} after the request is given up, and the chain goes
 * back to the last whole sweep it saved (at its start, then at most every {@link
 * #SAVE_INTERVAL_NANOS} of sweeping, and before every sweep once sweeps take longer than that).
 * Its checkpoint is then that sweep; draws handed on after it stay in the sink and are made again,
 * the same, by a resumed run. One update is bounded in turn by its sampler's cap on proposals.
 */
public final class ChainRunner {
  /** How often, at most, each chain reports progress. */
  private static final long PROGRESS_INTERVAL_NANOS = 250_000_000L;

  /** How long a sweep in progress at a stop request may still run before it is given up. */
  static final long STOP_GRACE_NANOS = 1_000_000_000L;

  /** Sweeping time between two saved states a given-up sweep goes back to. */
  static final long SAVE_INTERVAL_NANOS = 1_000_000_000L;

  private final RunSettings settings;
  private final ProgressListener listener;
  private final StopSignal stop;
  private final long stopGraceNanos;

  private ChainRunner(
      RunSettings settings, ProgressListener listener, StopSignal stop, long stopGraceNanos) {
    this.settings = settings;
    this.listener = listener;
    this.stop = stop;
    this.stopGraceNanos = stopGraceNanos;
  }

  /** A runner for {@code settings} that reports to {@code listener} and obeys {@code stop}. */
  public static ChainRunner of(RunSettings settings, ProgressListener listener, StopSignal stop) {
    if (settings == null) {
      throw new IllegalArgumentException("settings must not be null");
    }
    if (listener == null) {
      throw new IllegalArgumentException("listener must not be null");
    }
    if (stop == null) {
      throw new IllegalArgumentException("stop must not be null");
    }
    return new ChainRunner(settings, listener, stop, STOP_GRACE_NANOS);
  }

  /** This runner with another grace for a sweep in progress at a stop (tests). */
  ChainRunner withStopGrace(long nanos) {
    return new ChainRunner(settings, listener, stop, nanos);
  }

  /**
   * Runs every chain to its end or to a stop request, handing each kept draw to {@code sink}.
   *
   * @throws ChainFailedException when a kernel throws (the lowest-numbered failed chain is named)
   */
  public RunOutcome run(KernelFactory factory, DrawSink sink) {
    return resume(factory, sink, List.of());
  }

  /**
   * Continues each chain from {@code from} (a checkpoint's chain states, in chain order) to its
   * end or to a stop request; draws are numbered on from each chain's saved count. With an empty
   * {@code from} this is {@link #run}. The continued chains make exactly the draws an
   * uninterrupted run would have made: each kernel is made as in a fresh run (so that its
   * updaters are those of the same rules), then given its saved state and its saved generator.
   *
   * @throws IllegalArgumentException when {@code from} does not fit the settings or the kernels
   * @throws ChainFailedException when a kernel throws
   */
  public RunOutcome resume(KernelFactory factory, DrawSink sink, List<ChainState> from) {
    if (!from.isEmpty() && from.size() != settings.chains()) {
      throw new IllegalArgumentException(
          "the checkpoint has " + from.size() + " chains, the settings " + settings.chains());
    }
    ChainRandom[] generators = ChainSeeds.split(settings.seed(), settings.chains());
    List<ChainKernel> kernels = new ArrayList<>();
    long[] startSweep = new long[settings.chains()];
    int[] startDraws = new int[settings.chains()];
    for (int chain = 0; chain < settings.chains(); chain++) {
      ChainKernel kernel = factory.newChain(chain, generators[chain]);
      if (!from.isEmpty()) {
        ChainState saved = from.get(chain);
        if (!(kernel instanceof ResumableKernel resumable)) {
          throw new IllegalArgumentException("chain " + (chain + 1) + " cannot be resumed");
        }
        if (saved.sweep() > settings.totalSweeps()) {
          throw new IllegalArgumentException(
              "chain " + (chain + 1) + " was saved at sweep " + saved.sweep() + ", beyond the "
                  + settings.totalSweeps() + " sweeps of the run");
        }
        resumable.restore(saved.kernel());
        generators[chain] = ChainRandom.restore(saved.generator());
        startSweep[chain] = saved.sweep();
        startDraws[chain] = saved.draws();
      }
      kernels.add(kernel);
    }
    ChainState[] ends = new ChainState[settings.chains()];
    StopSignal abort = StopSignal.create();
    int[] kept = new int[settings.chains()];
    AtomicInteger threadNumber = new AtomicInteger();
    ExecutorService pool =
        Executors.newFixedThreadPool(
            Math.min(settings.threads(), settings.chains()),
            task -> {
              Thread thread = new Thread(task, "hullbound-chain-" + threadNumber.incrementAndGet());
              thread.setDaemon(true);
              return thread;
            });
    try {
      List<Future<?>> futures = new ArrayList<>();
      for (int chain = 0; chain < settings.chains(); chain++) {
        int index = chain;
        futures.add(
            pool.submit(
                () -> {
                  kept[index] =
                      runChain(
                          index, kernels.get(index), generators[index], startSweep[index],
                          startDraws[index], sink, abort, ends);
                  return null;
                }));
      }
      ChainFailedException failure = null;
      for (Future<?> future : futures) {
        Throwable cause = awaitQuietly(future);
        if (cause instanceof ChainFailedException chainFailure && failure == null) {
          failure = chainFailure;
        } else if (cause != null && failure == null) {
          throw new IllegalStateException("chain thread failed", cause);
        }
      }
      if (failure != null) {
        throw failure;
      }
    } finally {
      pool.shutdownNow();
    }
    boolean stoppedEarly = false;
    for (int count : kept) {
      stoppedEarly |= count < settings.draws();
    }
    List<ChainState> states = new ArrayList<>();
    for (ChainState end : ends) {
      if (end == null) {
        states.clear();
        break;
      }
      states.add(end);
    }
    return new RunOutcome(kernels, kept, stoppedEarly, states);
  }

  /** Waits for {@code future}; an interrupt of the waiting thread becomes a stop request. */
  private Throwable awaitQuietly(Future<?> future) {
    while (true) {
      try {
        future.get();
        return null;
      } catch (ExecutionException failed) {
        return failed.getCause();
      } catch (InterruptedException interrupted) {
        stop.request();
      }
    }
  }

  private int runChain(
      int chain, ChainKernel kernel, RandomGenerator rng, long firstSweep, int firstDraws,
      DrawSink sink, StopSignal abort, ChainState[] ends) {
    double[] row = new double[kernel.width()];
    long total = settings.totalSweeps();
    long start = System.nanoTime();
    long lastReport = start;
    int draws = firstDraws;
    long sweep = firstSweep;
    ChainState saved = save(kernel, rng, sweep, draws);
    long lastSave = start;
    BooleanSupplier giveUp = () -> stop.requestedLongerAgoThan(stopGraceNanos);
    boolean gaveUp = false;
    try {
      while (sweep < total && !stop.isRequested() && !abort.isRequested()) {
        long now = System.nanoTime();
        if (saved != null && now - lastSave >= SAVE_INTERVAL_NANOS) {
          saved = save(kernel, rng, sweep, draws);
          lastSave = now;
        }
        sweep++;
        if (!kernel.sweep(rng, giveUp)) {
          gaveUp = true;
          break;
        }
        long afterBurnIn = sweep - settings.burnIn();
        if (afterBurnIn > 0 && afterBurnIn % settings.thin() == 0) {
          draws++;
          kernel.record(row);
          sink.accept(chain, draws, row);
        }
        now = System.nanoTime();
        if (now - lastReport >= PROGRESS_INTERVAL_NANOS) {
          lastReport = now;
          listener.progress(progress(chain, sweep, firstSweep, draws, now - start, false));
        }
      }
    } catch (RuntimeException | Error failure) {
      abort.request();
      listener.progress(
          progress(chain, sweep, firstSweep, draws, System.nanoTime() - start, true));
      throw new ChainFailedException(chain, sweep, failure);
    }
    if (!gaveUp) {
      ends[chain] = save(kernel, rng, sweep, draws);
    } else if (saved != null) {
      // back to the last whole sweep saved: the checkpoint continues from there
      ((ResumableKernel) kernel).restore(saved.kernel());
      sweep = saved.sweep();
      draws = saved.draws();
      ends[chain] = saved;
    }
    listener.progress(progress(chain, sweep, firstSweep, draws, System.nanoTime() - start, true));
    return draws;
  }

  /** The chain's state between two sweeps, or null when its kernel or generator cannot be saved. */
  private static ChainState save(ChainKernel kernel, RandomGenerator rng, long sweep, int draws) {
    if (kernel instanceof ResumableKernel resumable && rng instanceof ChainRandom generator) {
      return new ChainState(sweep, draws, generator.state(), resumable.save());
    }
    return null;
  }

  private ChainProgress progress(
      int chain, long sweeps, long firstSweep, int draws, long elapsedNanos, boolean done) {
    long total = settings.totalSweeps();
    double sweepsPerSecond = elapsedNanos > 0 ? (sweeps - firstSweep) * 1e9 / elapsedNanos : 0.0;
    Duration left =
        done || sweepsPerSecond <= 0
            ? Duration.ZERO
            : Duration.ofMillis((long) Math.ceil((total - sweeps) / sweepsPerSecond * 1000.0));
    return new ChainProgress(
        chain, sweeps, settings.burnIn(), total, draws, settings.draws(), sweepsPerSecond,
        sweepsPerSecond / settings.thin(), left, done);
  }
}
