#!/usr/bin/env bash
# A real spark-submit run of fit-units and calibrate: Spark's own submit class (org.apache.spark.deploy.SparkSubmit,
# what bin/spark-submit ends in) with --master 'local[2]' against the built target/spark/hullbound-spark.jar,
# on a class path of Spark's jars alone (as a Spark installation's jars/ folder gives), compared byte
# for byte with the same batch on two local workers from the same jar. Everything comes from Maven
# Central through the spark profile; nothing is installed by hand. docs/spark.md, "Run".
#
#   scripts/spark-submit-check.sh         # the jar's build, then four short runs (2-3 min in all)
#
# Exit 0 when every run ends with 0 and Spark's files equal the local ones (the batch's
# summary.csv, units.csv and batch.txt, the calibration's ranks.csv).
set -euo pipefail
cd "$(dirname "$0")/.."
mvn -B -q -P spark -DskipTests package
mvn -B -q -P spark dependency:build-classpath -Dmdep.outputFile="$PWD/target/spark/classpath.txt" >/dev/null
# Spark's jars only: the profile's class path less hullbound's own libraries and test libraries,
# which the application jar carries itself (picocli, ejml, commons-csv) or never needs.
SPARK_CP=$(tr ':' '\n' < target/spark/classpath.txt \
  | grep -v -E '/(junit|jqwik|opentest4j|apiguardian|picocli|ejml|commons-csv)' | paste -sd: -)
# What Spark's launcher adds on Java 17 (the same list as pom.xml's spark.java.options): the
# launcher's shell script is not run here, so the JVM gets it directly.
OPTS=$(sed -n 's:.*<spark.java.options>\(.*\)</spark.java.options>.*:\1:p' pom.xml)

WORK=$(mktemp -d)
trap 'rm -rf "$WORK"' EXIT
printf 'model station\nindex reading\ndata y[reading] ~ normal(mean = mu, sd = 1)\nparam mu ~ normal(mean = 0, sd = 10)\n' \
  > "$WORK/station.hbm"
{
  echo "site,y"
  for site in 0 1 2 3 4 5; do
    for k in 0 1 2 3 4 5 6 7; do
      echo "s$site,$(( (k * 7 + site) % 5 - 2 )).$site"
    done
  done
} > "$WORK/all.csv"
BATCH=(fit-units "$WORK/station.hbm" --unit-column site --data "$WORK/all.csv" --seed 5
  --burn-in 100 --draws 500 --quiet)

CALIBRATION=(calibrate models/seedlings.hbm --data models/seedlings.csv --replicates 10 --seed 3
  --burn-in 100 --draws 49 --quiet)

submit() {
  # shellcheck disable=SC2086 # OPTS is a list of JVM options
  java $OPTS -cp "$SPARK_CP" org.apache.spark.deploy.SparkSubmit --master 'local[2]' \
    --class org.hullbound.cli.Main target/spark/hullbound-spark.jar "$@" --spark
}
submit "${BATCH[@]}" --out "$WORK/spark" 2> "$WORK/spark.log"
submit "${CALIBRATION[@]}" --out "$WORK/spark-calibration" 2> "$WORK/spark-calibration.log"
grep -q "on Spark (local\[2\]" "$WORK/spark.log" || { cat "$WORK/spark.log"; echo "not run on Spark"; exit 1; }
java -jar target/spark/hullbound-spark.jar "${BATCH[@]}" --workers 2 --out "$WORK/local" 2> "$WORK/local.log"
java -jar target/spark/hullbound-spark.jar "${CALIBRATION[@]}" --workers 2 \
  --out "$WORK/local-calibration" 2> "$WORK/local-calibration.log"
for file in summary.csv units.csv batch.txt; do
  cmp "$WORK/spark/$file" "$WORK/local/$file"
done
cmp "$WORK/spark-calibration/ranks.csv" "$WORK/local-calibration/ranks.csv"
grep "^hullbound fit-units" "$WORK/spark.log" "$WORK/local.log"
echo "spark-submit --master 'local[2]' and two local workers wrote the same summary.csv, units.csv"
echo "and batch.txt of a batch, and the same ranks.csv of a calibration"
