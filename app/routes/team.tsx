import { AreaPlaceholder } from "~/components/area-placeholder";
import { areaFor } from "~/components/areas";

export default function Page() {
  return <AreaPlaceholder area={areaFor("/team")} />;
}
