#!/usr/bin/env bash
# Calibration replicates of seedlings: 2 local workers against Spark local[2], in one run.
#
# Each engine runs the same calibration with R_SMALL and R_LARGE replicates (seed 3, the calibrate
# defaults); the time per replicate is the slope (t_large - t_small) / (R_LARGE - R_SMALL), so the
# JVM's start and Spark's context start-up (fixed costs) drop out. Prints both slopes, their ratio
# (goal: Spark within 1.3x of local) and Spark's overhead per replicate, and checks that both
# engines wrote the same ranks.csv. With CLINICS=1 it also times clinics on 2 local workers, for the
# on-paper estimate in docs/spark.md.
#
# Needs a quiet machine (uptime near 0 before it starts): both engines use both cores.
#   scripts/spark-timing.sh                 # 20 and 200 replicates
#   R_SMALL=10 R_LARGE=40 scripts/spark-timing.sh   # a quick check that it works
set -euo pipefail
cd "$(dirname "$0")/.."
R_SMALL=${R_SMALL:-20}
R_LARGE=${R_LARGE:-200}
OUT=target/spark/timing

mvn -B -q -o -P spark -DskipTests package
mvn -B -q -o -P spark dependency:build-classpath -Dmdep.outputFile="$PWD/target/spark/classpath.txt" >/dev/null
CP="target/spark/hullbound-spark.jar:$(cat target/spark/classpath.txt)"
# the same --add-opens list as the profile's tests (pom.xml, spark.java.options)
OPTS=$(sed -n 's:.*<spark.java.options>\(.*\)</spark.java.options>.*:\1:p' pom.xml)

# milliseconds of one calibration: $1 the folder name, $2 replicates, $3 extra JVM options (may be
# empty), the rest calibrate's own options
calibrate() {
  local name=$1 replicates=$2 jvm=$3
  shift 3
  local start end
  start=$(date +%s%N)
  # shellcheck disable=SC2086
  java $OPTS $jvm -cp "$CP" org.hullbound.cli.Main calibrate "${MODEL:-models/seedlings.hbm}" \
    --data "${DATA:-models/seedlings.csv}" --replicates "$replicates" --seed 3 --quiet \
    --overwrite --out "$OUT/$name" "$@" >/dev/null
  end=$(date +%s%N)
  echo $(( (end - start) / 1000000 ))
}

echo "uptime before: $(uptime)"
local_small=$(calibrate local-small "$R_SMALL" "" --workers 2)
local_large=$(calibrate local-large "$R_LARGE" "" --workers 2)
# -Dspark.master is what spark-submit --master sets
spark_small=$(calibrate spark-small "$R_SMALL" "-Dspark.master=local[2]" --spark)
spark_large=$(calibrate spark-large "$R_LARGE" "-Dspark.master=local[2]" --spark)
echo "uptime after:  $(uptime)"

cmp "$OUT/local-large/ranks.csv" "$OUT/spark-large/ranks.csv"
echo "ranks.csv of $R_LARGE replicates: identical on both engines"
awk -v ls="$local_small" -v ll="$local_large" -v ss="$spark_small" -v sl="$spark_large" \
    -v rs="$R_SMALL" -v rl="$R_LARGE" 'BEGIN {
  lp = (ll - ls) / (rl - rs); sp = (sl - ss) / (rl - rs);
  printf "local, 2 workers:  %d ms for %d, %d ms for %d replicates: %.1f ms a replicate (wall, 2 cores)\n", ls, rs, ll, rl, lp;
  printf "Spark local[2]:    %d ms for %d, %d ms for %d replicates: %.1f ms a replicate (wall, 2 cores)\n", ss, rs, sl, rl, sp;
  printf "ratio Spark / local per replicate: %.2f (goal <= 1.3); Spark overhead %.1f ms a replicate\n", sp / lp, sp - lp;
  printf "fixed costs (JVM start, and for Spark the context): local %.0f ms, Spark %.0f ms\n", ls - rs * lp, ss - rs * sp;
}'

if [[ "${CLINICS:-0}" == 1 ]]; then
  c_small=$(MODEL=models/clinics.hbm DATA=models/clinics.csv calibrate clinics-small 10 "" --workers 2)
  c_large=$(MODEL=models/clinics.hbm DATA=models/clinics.csv calibrate clinics-large 30 "" --workers 2)
  awk -v s="$c_small" -v l="$c_large" 'BEGIN {
    p = (l - s) / 20;
    printf "clinics, 2 workers: %.0f ms a replicate wall, %.0f core-ms a replicate\n", p, 2 * p;
  }'
fi
