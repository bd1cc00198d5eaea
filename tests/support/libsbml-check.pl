#!/usr/bin/perl
# Reads SBML on stdin and prints libSBML's consistency errors (severity error or fatal), one a line
# as "ERROR <id>: <message>"; prints nothing for a document libSBML accepts. Needs Debian's
# libsbml5-perl; tests that use it are skipped where it is not installed.
use strict;
use warnings;
use LibSBML;

local $/;
my $xml = <STDIN>;
my $document = LibSBML::readSBMLFromString($xml);
$document->checkConsistency();
for my $i (0 .. $document->getNumErrors() - 1) {
  my $error = $document->getError($i);
  next if $error->getSeverity() < $LibSBML::LIBSBML_SEV_ERROR;
  my $message = $error->getMessage();
  $message =~ s/\s+/ /g;
  print "ERROR ", $error->getErrorId(), ": ", $message, "\n";
}
